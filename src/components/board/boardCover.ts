// Days of cover and use rates as people read them on the board, the farm cards and the tank page.
import { displayUnits, formatNumber, formatVolume, fromSI, type UnitSystem } from '@shared/units';
import { i18n } from '@/i18n';

const t = (key: string, named: Record<string, unknown> = {}) => i18n.global.t(`board.cover.${key}`, named);

/**
 * Under this many days of cover a tank is shown amber. Our own choice, no published source: about
 * one missed round plus the time it takes to refill a tank or brew a new batch.
 */
export const SHORT_COVER_DAYS = 3;

/** Past this the exact figure means little: a year's use is far beyond the two weeks it came from. */
const LONG_COVER_DAYS = 365;

/** True when days of cover is known and under SHORT_COVER_DAYS. */
export function isShortCover(daysOfCover: number | null): boolean {
  return daysOfCover !== null && daysOfCover < SHORT_COVER_DAYS;
}

/** The days as text: one decimal under two days ("1.4 days"), whole days above ("9 days"). */
export function formatCoverDays(daysOfCover: number): string {
  if (daysOfCover >= LONG_COVER_DAYS) return t('overAYear');
  // A tenth of a day is the finest step shown; a day is too coarse when less than two are left.
  if (daysOfCover < 2) {
    if (daysOfCover > 0 && daysOfCover < 0.05) return t('underATenth');
    return t('daysFraction', { n: formatNumber(daysOfCover, 1) });
  }
  return t('daysWhole', { n: formatNumber(daysOfCover, 0) });
}

/**
 * True when a reading showed usable litres but the use since then has likely drawn them all: its
 * litres are no longer what the tank holds, so screens show the estimate (about 0 L) in their place.
 */
export function isLikelyRunDown(daysOfCover: number | null, usableAtReadingL: number | null): boolean {
  return daysOfCover !== null && daysOfCover <= 0 && usableAtReadingL !== null && usableAtReadingL > 0;
}

/**
 * "≈ 9 days left", "≈ 1.4 days left", "Nothing usable left"; "No use seen" for null. Cover is counted
 * from the latest reading, so a tank read with litres above its outlet whose use has since run past
 * them is "Likely run down by now": its litres are shown small, with the reading's age.
 */
export function coverText(daysOfCover: number | null, usableAtReadingL: number | null = null): string {
  if (daysOfCover === null) return t('noUse');
  if (daysOfCover <= 0) return isLikelyRunDown(daysOfCover, usableAtReadingL) ? t('runDown') : t('nothingLeft');
  return t('left', { days: formatCoverDays(daysOfCover) });
}

/** A volume with enough decimals to be read: one below 10 of the shown unit ("3.4 L", "120 L"). */
export function formatSmallVolume(volumeL: number, system: UnitSystem): string {
  const shown = Math.abs(fromSI(volumeL, displayUnits(system).volume));
  return formatVolume(volumeL, system, shown > 0 && shown < 9.95 ? 1 : 0);
}

/** A use rate given in L/day in the user's units ("120 L/day", "3.4 gal/day"). */
export function formatUseRate(lPerDay: number, system: UnitSystem): string {
  return t('perDay', { volume: formatSmallVolume(lPerDay, system) });
}
