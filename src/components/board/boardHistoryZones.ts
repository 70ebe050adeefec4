import type { BoardHistoryFarm } from '@shared/schemas';
import { i18n } from '@/i18n';

/**
 * The line under the board history saying whose clock its days follow: one zone for every farm, or
 * each farm with its zone when they differ (and what a farm not yet at the last day shows there).
 */
export function historyZoneNote(farms: readonly BoardHistoryFarm[] | undefined, lastDay: string | undefined): string | null {
  if (!farms?.length) return null;
  const zones = [...new Set(farms.map((f) => f.timeZone))];
  const { t } = i18n.global;
  if (zones.length === 1) return t('board.chart.oneZone', { zone: zones[0] });
  const each = farms.map((f) => t('board.chart.farmZone', { farm: f.name, zone: f.timeZone })).join(', ');
  const behind = lastDay !== undefined && farms.some((f) => f.today < lastDay);
  return t(behind ? 'board.chart.eachZoneBehind' : 'board.chart.eachZone', { farms: each });
}
