import { fromSI, UNIT_SYMBOLS } from './convert';

/** A user's choice of display units; storage stays SI (mm, L, kPa, °C). */
export type UnitSystem = 'metric' | 'us';

/** The units a unit system shows for each quantity. */
export interface DisplayUnits {
  length: 'mm' | 'in';
  volume: 'L' | 'usgal';
  pressure: 'kPa' | 'psi';
  temperature: 'C' | 'F';
}

const METRIC: DisplayUnits = { length: 'mm', volume: 'L', pressure: 'kPa', temperature: 'C' };
const US: DisplayUnits = { length: 'in', volume: 'usgal', pressure: 'psi', temperature: 'F' };

/** The display unit of each quantity for `system` (metric: mm, L, kPa, °C; us: in, US gal, psi, °F). */
export function displayUnits(system: UnitSystem): DisplayUnits {
  return system === 'us' ? US : METRIC;
}

// The locale numbers are written in when a call names none. The client hands over a function reading the
// person's language (src/i18n), so a screen's figures are redrawn when it changes; the server passes each
// recipient's locale explicitly instead.
let numberLocale: () => string = () => 'en-US';

/**
 * Makes `locale` (a BCP 47 tag such as "es-ES", or a function answering one each time a number is formatted)
 * the default locale of every number formatted here; a tag Intl does not accept is ignored.
 */
export function setNumberLocale(locale: string | (() => string)): void {
  if (typeof locale === 'function') {
    numberLocale = locale;
    return;
  }
  try {
    new Intl.NumberFormat(locale);
    numberLocale = () => locale;
  } catch {
    // An invalid tag keeps the locale in use.
  }
}

/** The locale numbers are formatted in when a call names none ("en-US" until setNumberLocale). */
export function getNumberLocale(): string {
  return numberLocale();
}

// One formatter per locale and digit count: building an Intl.NumberFormat costs far more than using one.
const formatters = new Map<string, Intl.NumberFormat>();

function formatterFor(locale: string, minDigits: number, maxDigits: number): Intl.NumberFormat {
  const key = `${locale}|${minDigits}|${maxDigits}`;
  let fmt = formatters.get(key);
  if (!fmt) {
    fmt = new Intl.NumberFormat(locale, { minimumFractionDigits: minDigits, maximumFractionDigits: maxDigits });
    formatters.set(key, fmt);
  }
  return fmt;
}

/**
 * `value` as text with thousands grouping and exactly `digits` decimals in `locale` (default: the one set
 * by setNumberLocale, en-US to start: "1,234.5"; es-ES "1234,5"; fr-FR "1 234,5"); "—" when not finite.
 */
export function formatNumber(value: number, digits = 0, locale = numberLocale()): string {
  if (!Number.isFinite(value)) return '—';
  const d = Math.min(20, Math.max(0, Math.trunc(digits)));
  // Values that round to zero would otherwise print as "-0".
  const rounded = Math.abs(value) < 0.5 * 10 ** -d ? 0 : value;
  return formatterFor(locale, d, d).format(rounded);
}

/** `value` as text with grouping and at most `maxDigits` decimals, trailing zeros dropped ("1,830", "420.5" in en-US). */
export function formatNumberTrimmed(value: number, maxDigits = 3, locale = numberLocale()): string {
  if (!Number.isFinite(value)) return '—';
  const d = Math.min(20, Math.max(0, Math.trunc(maxDigits)));
  const rounded = Math.abs(value) < 0.5 * 10 ** -d ? 0 : value;
  return formatterFor(locale, 0, d).format(rounded);
}

/** A volume given in litres as text in the system's unit ("1,234 L", "326 gal"); `digits` decimals, default 0. */
export function formatVolume(volumeL: number, system: UnitSystem, digits = 0, locale = numberLocale()): string {
  const unit = displayUnits(system).volume;
  return `${formatNumber(fromSI(volumeL, unit), digits, locale)} ${UNIT_SYMBOLS[unit]}`;
}

/** A length given in millimetres as text ("1,250 mm", "12.5 in"); default 0 decimals for mm, 1 for inches. */
export function formatLength(mm: number, system: UnitSystem, digits?: number, locale = numberLocale()): string {
  const unit = displayUnits(system).length;
  return `${formatNumber(fromSI(mm, unit), digits ?? (unit === 'in' ? 1 : 0), locale)} ${UNIT_SYMBOLS[unit]}`;
}

/** A temperature given in °C as text ("18.5 °C", "65.3 °F"); `digits` decimals, default 1. */
export function formatTemperature(celsius: number, system: UnitSystem, digits = 1, locale = numberLocale()): string {
  const unit = displayUnits(system).temperature;
  return `${formatNumber(fromSI(celsius, unit), digits, locale)} ${UNIT_SYMBOLS[unit]}`;
}

/** A gauge pressure given in kPa as text ("12.3 kPa", "1.78 psi"); default 1 decimal for kPa, 2 for psi. */
export function formatPressure(kPa: number, system: UnitSystem, digits?: number, locale = numberLocale()): string {
  const unit = displayUnits(system).pressure;
  return `${formatNumber(fromSI(kPa, unit), digits ?? (unit === 'psi' ? 2 : 1), locale)} ${UNIT_SYMBOLS[unit]}`;
}
