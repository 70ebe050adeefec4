// Readings: sight tube, ultrasonic and pressure readings → level above the floor → volumes.
export { WATER_DENSITY_KG_M3, levelFromSightTube, levelFromUltrasonic, levelFromPressure } from './levels';
export { MAX_SPECIFIC_GRAVITY, tankVolumes, readingToVolumes } from './volumes';
export type { TankLevels, TankVolumes, TankSetup, ReadingInput, ReadingResult } from './volumes';
export { tankSetupOf } from './setup';
export type { StoredTankSetup } from './setup';
export { usableCapacityL, stockFigures } from './figures';
export type { StockFigures } from './figures';
export { STOCK_JUMP_SHARE, stockJump, cultureTemperatureOutside } from './checks';
export type { StockJump } from './checks';
