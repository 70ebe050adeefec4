import { BAR_KPA, FOOT_MM, IMPERIAL_GALLON_L, INCH_MM, INCH_WATER_KPA, METRE_WATER_KPA, PSI_KPA, US_GALLON_L } from './factors';

/** Length units a user may type or see; stored as millimetres. */
export const LENGTH_UNITS = ['mm', 'cm', 'm', 'in', 'ft'] as const;
/** Volume units; stored as litres. */
export const VOLUME_UNITS = ['L', 'm3', 'usgal', 'impgal'] as const;
/** Pressure units (gauge pressure); stored as kilopascals. */
export const PRESSURE_UNITS = ['kPa', 'bar', 'psi', 'mH2O', 'inH2O'] as const;
/** Temperature units; stored as degrees Celsius. */
export const TEMPERATURE_UNITS = ['C', 'F'] as const;

/** A length unit name. */
export type LengthUnit = (typeof LENGTH_UNITS)[number];
/** A volume unit name. */
export type VolumeUnit = (typeof VOLUME_UNITS)[number];
/** A pressure unit name. */
export type PressureUnit = (typeof PRESSURE_UNITS)[number];
/** A temperature unit name. */
export type TemperatureUnit = (typeof TEMPERATURE_UNITS)[number];
/** Any unit this module converts. */
export type Unit = LengthUnit | VolumeUnit | PressureUnit | TemperatureUnit;
/** The physical quantity a unit measures. */
export type Quantity = 'length' | 'volume' | 'pressure' | 'temperature';

/** The unit each quantity is stored in (mm, L, kPa, °C): what `toSI` returns and `fromSI` takes. */
export const STORAGE_UNITS = { length: 'mm', volume: 'L', pressure: 'kPa', temperature: 'C' } as const;

/** How many storage units (mm, L or kPa) one of each linear unit is. Temperature is affine and handled apart. */
export const UNIT_FACTORS: Readonly<Record<Exclude<Unit, TemperatureUnit>, number>> = {
  mm: 1,
  cm: 10,
  m: 1000,
  in: INCH_MM,
  ft: FOOT_MM,
  L: 1,
  m3: 1000,
  usgal: US_GALLON_L,
  impgal: IMPERIAL_GALLON_L,
  kPa: 1,
  bar: BAR_KPA,
  psi: PSI_KPA,
  mH2O: METRE_WATER_KPA,
  inH2O: INCH_WATER_KPA,
};

/** The symbol shown after a value in each unit ("L", "gal", "°C"). */
export const UNIT_SYMBOLS: Readonly<Record<Unit, string>> = {
  mm: 'mm',
  cm: 'cm',
  m: 'm',
  in: 'in',
  ft: 'ft',
  L: 'L',
  m3: 'm³',
  usgal: 'gal',
  impgal: 'imp gal',
  kPa: 'kPa',
  bar: 'bar',
  psi: 'psi',
  mH2O: 'mH₂O',
  inH2O: 'inH₂O',
  C: '°C',
  F: '°F',
};

const QUANTITY: Readonly<Record<Unit, Quantity>> = {
  mm: 'length',
  cm: 'length',
  m: 'length',
  in: 'length',
  ft: 'length',
  L: 'volume',
  m3: 'volume',
  usgal: 'volume',
  impgal: 'volume',
  kPa: 'pressure',
  bar: 'pressure',
  psi: 'pressure',
  mH2O: 'pressure',
  inH2O: 'pressure',
  C: 'temperature',
  F: 'temperature',
};

/** True when `unit` is a unit name this module knows. */
export function isUnit(unit: unknown): unit is Unit {
  return typeof unit === 'string' && Object.prototype.hasOwnProperty.call(QUANTITY, unit);
}

/** The quantity (length, volume, pressure, temperature) a unit measures; throws RangeError for an unknown unit. */
export function quantityOf(unit: Unit): Quantity {
  if (!isUnit(unit)) throw new RangeError(`Unknown unit "${String(unit)}"`);
  return QUANTITY[unit];
}

/** `value` in `unit` expressed in the stored unit of its quantity (mm, L, kPa or °C). */
export function toSI(value: number, unit: Unit): number {
  if (quantityOf(unit) === 'temperature') return unit === 'F' ? ((value - 32) * 5) / 9 : value;
  return unit === 'mm' || unit === 'L' || unit === 'kPa' ? value : value * UNIT_FACTORS[unit as keyof typeof UNIT_FACTORS];
}

/** `value` given in the stored unit of its quantity (mm, L, kPa or °C) expressed in `unit`. */
export function fromSI(value: number, unit: Unit): number {
  if (quantityOf(unit) === 'temperature') return unit === 'F' ? (value * 9) / 5 + 32 : value;
  return unit === 'mm' || unit === 'L' || unit === 'kPa' ? value : value / UNIT_FACTORS[unit as keyof typeof UNIT_FACTORS];
}

/** `value` in unit `from` expressed in unit `to` of the same quantity; throws TypeError across quantities. */
export function convert(value: number, from: LengthUnit, to: LengthUnit): number;
export function convert(value: number, from: VolumeUnit, to: VolumeUnit): number;
export function convert(value: number, from: PressureUnit, to: PressureUnit): number;
export function convert(value: number, from: TemperatureUnit, to: TemperatureUnit): number;
export function convert(value: number, from: Unit, to: Unit): number;
export function convert(value: number, from: Unit, to: Unit): number {
  const qFrom = quantityOf(from);
  const qTo = quantityOf(to);
  if (qFrom !== qTo) throw new TypeError(`Cannot convert ${from} (${qFrom}) to ${to} (${qTo})`);
  if (from === to) return value;
  return fromSI(toSI(value, from), to);
}
