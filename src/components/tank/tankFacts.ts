// Words for a tank's sight-tube zero mark and its calibration versions, as the tank page shows them.
import type { TankCalibrationVersion } from '@shared/schemas';
import { formatLength, type UnitSystem } from '@shared/units';

/**
 * Where the tube's zero mark sits, in words a worker can check with a tape: "30 mm below the floor",
 * "45 mm above the floor" or "At the floor" (the offset is the mark's height above the floor, in mm).
 */
export function zeroMarkText(datumOffsetMm: number, system: UnitSystem): string {
  const shown = formatLength(Math.abs(datumOffsetMm), system);
  // A mark a hair off the floor prints as "0 mm"; say "at the floor" then, never "0 mm below".
  if (datumOffsetMm === 0 || /^0(\.0+)? /.test(shown)) return 'At the floor';
  return `${shown} ${datumOffsetMm < 0 ? 'below' : 'above'} the floor`;
}

/** A calendar date on the farm's clock, e.g. "3 Mar 2026"; "—" for a bad date. */
export function formatDateInZone(iso: string, timeZone: string | undefined): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  try {
    return new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone }).format(date);
  } catch {
    return new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' }).format(date);
  }
}

/** A calibration version as people see it: "Version 3 · 12 Mar 2026" (its number and the day it was made). */
export function calibrationLabel(version: Pick<TankCalibrationVersion, 'number' | 'createdAt'>, timeZone: string | undefined): string {
  return `Version ${version.number} · ${formatDateInZone(version.createdAt, timeZone)}`;
}

/** The version a reading was stored with, found by the key it carries; null when the tank's list lacks it. */
export function versionOfReading(versions: readonly TankCalibrationVersion[], key: string): TankCalibrationVersion | null {
  return versions.find((v) => v.key === key) ?? null;
}
