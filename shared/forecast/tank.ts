// A tank's forecast in one call: use rate and spread, days of cover, projected empty date and
// suspected leaks, with the noise band taken from how well a sight tube can be read.
import { heightMm, volumeAtLevel, type TankGeometry } from '../calibration/index';
import { dailyUse, daysOfCover, projectedEmptyDate } from './daily';
import { detectLeak, type LeakWindow, type QuietHours } from './leak';
import type { LevelReading } from './series';

/** How far a sight-tube reading can be off (mm): common practice, no published source. */
export const SIGHT_TUBE_TOLERANCE_MM = 3;

/** Half-width of the noise band in litres for a reading tolerance at a level (L): the volume of ±toleranceMm about it. */
export function noiseBandL(geometry: TankGeometry, levelMm: number, toleranceMm = SIGHT_TUBE_TOLERANCE_MM): number {
  const top = heightMm(geometry);
  const lo = Math.max(0, Math.min(top, levelMm) - toleranceMm);
  const hi = Math.min(top, Math.max(0, levelMm) + toleranceMm);
  return (volumeAtLevel(geometry, hi) - volumeAtLevel(geometry, lo)) / 2;
}

/** Inputs of tankForecast. */
export interface TankForecastInput {
  geometry: TankGeometry;
  /** Usable volume now (L). */
  usableL: number;
  /** Level now (mm above the floor), where the noise band is measured. */
  levelMm: number;
  now: number;
  /** The farm's IANA time zone: its local days, each with its own offset, bound the window and the quiet hours. */
  timeZone: string;
  windowDays?: number;
  quietHours?: QuietHours;
  /** Loss rate in quiet hours that counts as a suspected leak (L/h). */
  leakThresholdLPerHour?: number;
}

/** A tank's forecast: litres per day, days, epoch ms, and suspected leak windows. */
export interface TankForecast {
  meanLPerDay: number;
  sdLPerDay: number;
  /** Whole days of data behind the rate. */
  days: number;
  /** Days the usable volume lasts at the mean rate; null when no use was seen. */
  daysOfCover: number | null;
  projectedEmptyAt: number | null;
  noiseL: number;
  leaks: LeakWindow[];
}

/** Use, cover and leaks from a level series of volumes (L) over the last `windowDays` (default 14) local days. */
export function tankForecast(series: readonly LevelReading[], input: TankForecastInput): TankForecast {
  const noiseL = noiseBandL(input.geometry, input.levelMm);
  const use = dailyUse(series, { windowDays: input.windowDays ?? 14, now: input.now, noiseL, timeZone: input.timeZone });
  const cover = daysOfCover(input.usableL, use.meanLPerDay);
  const leaks = input.quietHours
    ? detectLeak(series, { quietHours: input.quietHours, timeZone: input.timeZone, thresholdLPerHour: input.leakThresholdLPerHour ?? Number.POSITIVE_INFINITY, noiseL })
    : [];
  return {
    meanLPerDay: use.meanLPerDay,
    sdLPerDay: use.sdLPerDay,
    days: use.days,
    daysOfCover: Number.isFinite(cover) ? cover : null,
    projectedEmptyAt: projectedEmptyDate(input.now, input.usableL, use.meanLPerDay),
    noiseL,
    leaks,
  };
}
