import type { BoardHistoryFarm } from '@shared/schemas';

/**
 * The line under the board history saying whose clock its days follow: one zone for every farm, or
 * each farm with its zone when they differ (and what a farm not yet at the last day shows there).
 */
export function historyZoneNote(farms: readonly BoardHistoryFarm[] | undefined, lastDay: string | undefined): string | null {
  if (!farms?.length) return null;
  const zones = [...new Set(farms.map((f) => f.timeZone))];
  if (zones.length === 1) return `Days run from midnight to midnight in ${zones[0]}.`;
  const each = farms.map((f) => `${f.name} (${f.timeZone})`).join(', ');
  const behind = lastDay !== undefined && farms.some((f) => f.today < lastDay);
  return `Each farm's days run from its own midnight: ${each}.${behind ? ' A farm whose clock has not reached the last day yet counts its latest reading there.' : ''}`;
}
