// The board store's pure part: folding one numbered delta into the farms shown, and the order in
// which buffered deltas can be applied after a board.
import type { BoardDelta, FarmBoard } from '@shared/schemas';

/** Farms in the order the board shows them. */
export function byFarmName(a: FarmBoard, b: FarmBoard): number {
  return a.name.localeCompare(b.name);
}

/** The farms after one delta: changed tiles replaced or added, tanks and farms that left removed, farm totals replaced. */
export function foldDelta(farms: readonly FarmBoard[], delta: BoardDelta): FarmBoard[] {
  const byId = new Map(farms.map((f) => [f.farmId, f]));
  for (const change of delta.farms) {
    const before = byId.get(change.farmId);
    const removed = new Set(change.removedTankIds);
    const tiles = new Map((before?.tanks ?? []).filter((t) => !removed.has(t.tankId)).map((t) => [t.tankId, t]));
    for (const tile of change.tanks) tiles.set(tile.tankId, tile);
    if (tiles.size) byId.set(change.farmId, { farmId: change.farmId, name: change.name, totals: change.totals, tanks: [...tiles.values()] });
    else byId.delete(change.farmId);
  }
  for (const id of delta.removedFarmIds) byId.delete(id);
  return [...byId.values()].sort(byFarmName);
}

/**
 * Of deltas received while the board was being fetched, the ones after `seq` that follow on without
 * a gap (in order), and whether a gap was left (something was lost: fetch again).
 */
export function followingDeltas(buffered: readonly BoardDelta[], epoch: string, seq: number): { next: BoardDelta[]; gap: boolean } {
  const after = buffered.filter((d) => d.epoch === epoch && d.seq > seq).sort((a, b) => a.seq - b.seq);
  const next: BoardDelta[] = [];
  let at = seq;
  for (const d of after) {
    if (d.seq === at) continue;
    if (d.seq !== at + 1) return { next, gap: true };
    next.push(d);
    at = d.seq;
  }
  return { next, gap: buffered.some((d) => d.epoch !== epoch) };
}
