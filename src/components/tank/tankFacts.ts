// Words for a tank's sight-tube zero mark and its calibration versions, as the tank page shows them.
import type { TankCalibrationVersion } from '@shared/schemas';
import { formatLength, type UnitSystem } from '@shared/units';
import { currentLocale } from '@/i18n';
import { tankText } from './tankWords';

/**
 * Where the tube's zero mark sits, in words a worker can check with a tape: "30 mm below the floor",
 * "45 mm above the floor" or "At the floor" (the offset is the mark's height above the floor, in mm).
 */
export function zeroMarkText(datumOffsetMm: number, system: UnitSystem): string {
  return zeroMarkWords(datumOffsetMm, system, { atFloor: 'atFloor', below: 'below', above: 'above' });
}

/** The same place as a sentence of its own: "The zero mark is 30 mm below the floor." (the editor's check). */
export function zeroMarkSentence(datumOffsetMm: number, system: UnitSystem): string {
  return zeroMarkWords(datumOffsetMm, system, { atFloor: 'sentenceAtFloor', below: 'sentenceBelow', above: 'sentenceAbove' });
}

function zeroMarkWords(datumOffsetMm: number, system: UnitSystem, keys: { atFloor: string; below: string; above: string }): string {
  const shown = formatLength(Math.abs(datumOffsetMm), system);
  // A mark a hair off the floor prints as "0 mm" (or "0,0 in"); say "at the floor" then, never "0 mm below".
  if (datumOffsetMm === 0 || /^0([.,]0+)?\s/.test(shown)) return tankText(`zeroMark.${keys.atFloor}`);
  return tankText(`zeroMark.${datumOffsetMm < 0 ? keys.below : keys.above}`, { length: shown });
}

/** A calendar date on the farm's clock in the language's locale, e.g. "Mar 3, 2026"; "—" for a bad date. */
export function formatDateInZone(iso: string, timeZone: string | undefined): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  const locale = currentLocale();
  try {
    return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone }).format(date);
  } catch {
    return new Intl.DateTimeFormat(locale, { dateStyle: 'medium' }).format(date);
  }
}

/** A calibration version as people see it: "Version 3 · 12 Mar 2026" (its number and the day it was made). */
export function calibrationLabel(version: Pick<TankCalibrationVersion, 'number' | 'createdAt'>, timeZone: string | undefined): string {
  return tankText('facts.calibrationVersion', { number: version.number, date: formatDateInZone(version.createdAt, timeZone) });
}

/** The version a reading was stored with, found by the key it carries; null when the tank's list lacks it. */
export function versionOfReading(versions: readonly TankCalibrationVersion[], key: string): TankCalibrationVersion | null {
  return versions.find((v) => v.key === key) ?? null;
}
