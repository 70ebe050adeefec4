// Frost ahead: the coldest forecast hour under a farm's threshold in the next two days, and which
// tanks it concerns. The forecast is of air 2 m above ground; a clear still night makes ground frost
// while that air still reads a few degrees above zero, hence a threshold above 0 °C.
import type { TankContents } from '../schemas/index';
import { formatNumberTrimmed } from '../units/index';

/**
 * Default forecast air temperature (°C) under which frost is expected at ground level: 2 °C, about the
 * 36 °F top of the range for which the US National Weather Service issues frost advisories (33–36 °F;
 * recalled from memory, not checked against a published page). Farms set their own.
 */
export const FROST_AHEAD_C = 2;
/** How far ahead the forecast is read (hours). */
export const FROST_AHEAD_HOURS = 48;

/** True when a new tank of these contents starts exposed to frost: water and fertilizer, usually outdoors (common practice, no published source). */
export function defaultExposedToFrost(contents: TankContents): boolean {
  return contents === 'water' || contents === 'fertilizer';
}

/** True when a frost ahead concerns the tank: it stands exposed, or it holds a culture kept warm (its heater must cope). */
export function watchedForFrost(tank: { contents: TankContents; exposedToFrost: boolean }): boolean {
  return tank.exposedToFrost || tank.contents === 'culture';
}

/**
 * The coldest hour strictly under `thresholdC` (°C) in the `hours` after `nowMs` (epoch ms), the earliest
 * of equals; null when every forecast hour is at or above it. Hours before now (more than one hour past) are skipped.
 */
export function frostAheadOf(forecast: readonly { atMs: number; airC: number }[], thresholdC: number, nowMs: number, hours = FROST_AHEAD_HOURS): { atMs: number; lowC: number } | null {
  let coldest: { atMs: number; lowC: number } | null = null;
  for (const h of forecast) {
    if (h.atMs < nowMs - 3_600_000 || h.atMs > nowMs + hours * 3_600_000) continue;
    if (h.airC < thresholdC && (!coldest || h.airC < coldest.lowC || (h.airC === coldest.lowC && h.atMs < coldest.atMs))) coldest = { atMs: h.atMs, lowC: h.airC };
  }
  return coldest;
}

/** The flag's sentence for one tank: the low, when (as the farm's local time), and the threshold. */
export function frostAheadMessage(tank: { name: string; contents: TankContents }, frost: { atMs: number; lowC: number }, thresholdC: number, timeZone: string): string {
  const when = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'short', day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(frost.atMs);
  const what = tank.contents === 'culture' ? 'keep the culture warm' : 'drain, cover or heat its lines';
  return `${tank.name}: air forecast to fall to ${formatNumberTrimmed(frost.lowC, 1)} °C around ${when} (under ${formatNumberTrimmed(thresholdC, 1)} °C): ${what}`;
}
