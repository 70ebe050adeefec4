export { type LevelReading, type LevelMovement, type MovementKind, MS_PER_DAY, MS_PER_HOUR } from './series';
export { splitMovements, type SplitOptions } from './movements';
export { dailyUse, daysOfCover, daysOfCoverSince, projectedEmptyDate, type DailyUseOptions, type DailyUse } from './daily';
export { detectLeak, type QuietHours, type LeakOptions, type LeakWindow } from './leak';
export { tankForecast, noiseBandL, SIGHT_TUBE_TOLERANCE_MM, type TankForecast, type TankForecastInput } from './tank';
