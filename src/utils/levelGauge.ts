import type { TankTile } from '@shared/schemas';

/** Where a tile's level graphic draws the liquid and the low-stock line: fractions 0–1 of the capacity. */
export interface GaugeMarks {
  /** Gross volume over capacity; null when the tank has no reading. */
  fill: number | null;
  /** The gross volume at which usable stock reaches the low-stock level, over capacity; null when none is set. */
  lowLine: number | null;
}

const unit = (v: number) => (v < 0 ? 0 : v > 1 ? 1 : v);

/**
 * Marks for the level graphic, drawn by volume. The low-stock level is a usable volume, so the line
 * sits above it by the volume below the outlet; a tile knows that volume only as gross − usable of a
 * reading above the outlet, and without one the line is drawn at the low-stock volume itself.
 */
export function gaugeMarks(tile: Pick<TankTile, 'capacityL' | 'lowStockL' | 'grossL' | 'usableL' | 'percentFull'>): GaugeMarks {
  if (!(tile.capacityL > 0)) return { fill: null, lowLine: null };
  const fill = tile.percentFull === null ? null : unit(tile.percentFull / 100);
  if (!(tile.lowStockL > 0)) return { fill, lowLine: null };
  const belowOutletL = tile.grossL !== null && tile.usableL !== null && tile.usableL > 0 ? tile.grossL - tile.usableL : 0;
  return { fill, lowLine: unit((tile.lowStockL + belowOutletL) / tile.capacityL) };
}
