// Units: conversions between the units users type or read and the stored units (mm, L, kPa, °C),
// and the text shown for each unit system.
export {
  INCH_MM,
  FOOT_MM,
  US_GALLON_L,
  IMPERIAL_GALLON_L,
  STANDARD_GRAVITY_M_S2,
  POUND_KG,
  PSI_KPA,
  BAR_KPA,
  METRE_WATER_KPA,
  INCH_WATER_KPA,
} from './factors';
export {
  LENGTH_UNITS,
  VOLUME_UNITS,
  PRESSURE_UNITS,
  TEMPERATURE_UNITS,
  STORAGE_UNITS,
  UNIT_FACTORS,
  UNIT_SYMBOLS,
  isUnit,
  quantityOf,
  toSI,
  fromSI,
  convert,
} from './convert';
export type { LengthUnit, VolumeUnit, PressureUnit, TemperatureUnit, Unit, Quantity } from './convert';
export { displayUnits, setNumberLocale, getNumberLocale, formatNumber, formatNumberTrimmed, formatVolume, formatLength, formatTemperature, formatPressure } from './format';
export type { UnitSystem, DisplayUnits } from './format';
export { decimalMarkOf, parseDecimal } from './decimal';
export type { DecimalMark, DecimalOptions, DecimalProblem, DecimalResult } from './decimal';
