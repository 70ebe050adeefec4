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

// One formatter per digit count: building an Intl.NumberFormat costs far more than using one.
const formatters = new Map<number, Intl.NumberFormat>();

/** `value` as en-US text with thousands grouping and exactly `digits` decimals ("1,234.5"); "—" when not finite. */
export function formatNumber(value: number, digits = 0): string {
  if (!Number.isFinite(value)) return '—';
  const d = Math.min(20, Math.max(0, Math.trunc(digits)));
  let fmt = formatters.get(d);
  if (!fmt) {
    fmt = new Intl.NumberFormat('en-US', { minimumFractionDigits: d, maximumFractionDigits: d });
    formatters.set(d, fmt);
  }
  // Values that round to zero would otherwise print as "-0".
  const rounded = Math.abs(value) < 0.5 * 10 ** -d ? 0 : value;
  return fmt.format(rounded);
}

const trimmedFormatters = new Map<number, Intl.NumberFormat>();

/** `value` as en-US text with grouping and at most `maxDigits` decimals, trailing zeros dropped ("1,830", "420.5"). */
export function formatNumberTrimmed(value: number, maxDigits = 3): string {
  if (!Number.isFinite(value)) return '—';
  const d = Math.min(20, Math.max(0, Math.trunc(maxDigits)));
  let fmt = trimmedFormatters.get(d);
  if (!fmt) {
    fmt = new Intl.NumberFormat('en-US', { minimumFractionDigits: 0, maximumFractionDigits: d });
    trimmedFormatters.set(d, fmt);
  }
  const rounded = Math.abs(value) < 0.5 * 10 ** -d ? 0 : value;
  return fmt.format(rounded);
}

/** A volume given in litres as text in the system's unit ("1,234 L", "326 gal"); `digits` decimals, default 0. */
export function formatVolume(volumeL: number, system: UnitSystem, digits = 0): string {
  const unit = displayUnits(system).volume;
  return `${formatNumber(fromSI(volumeL, unit), digits)} ${UNIT_SYMBOLS[unit]}`;
}

/** A length given in millimetres as text ("1,250 mm", "12.5 in"); default 0 decimals for mm, 1 for inches. */
export function formatLength(mm: number, system: UnitSystem, digits?: number): string {
  const unit = displayUnits(system).length;
  return `${formatNumber(fromSI(mm, unit), digits ?? (unit === 'in' ? 1 : 0))} ${UNIT_SYMBOLS[unit]}`;
}

/** A temperature given in °C as text ("18.5 °C", "65.3 °F"); `digits` decimals, default 1. */
export function formatTemperature(celsius: number, system: UnitSystem, digits = 1): string {
  const unit = displayUnits(system).temperature;
  return `${formatNumber(fromSI(celsius, unit), digits)} ${UNIT_SYMBOLS[unit]}`;
}

/** A gauge pressure given in kPa as text ("12.3 kPa", "1.78 psi"); default 1 decimal for kPa, 2 for psi. */
export function formatPressure(kPa: number, system: UnitSystem, digits?: number): string {
  const unit = displayUnits(system).pressure;
  return `${formatNumber(fromSI(kPa, unit), digits ?? (unit === 'psi' ? 2 : 1))} ${UNIT_SYMBOLS[unit]}`;
}
