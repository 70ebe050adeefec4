// The board store's pure part: folding one numbered delta into the farms shown, and the order in
// which buffered deltas can be applied after a board.
import { totalsOf } from '@shared/board';
import { tankTileSchema, type BoardDelta, type FarmBoard } from '@shared/schemas';

/** Farms in the order the board shows them. */
export function byFarmName(a: FarmBoard, b: FarmBoard): number {
  return a.name.localeCompare(b.name);
}

/**
 * The farms after one delta: each tile's changed fields laid over it (a new tile taken whole), tanks
 * and farms that left removed, each changed farm's totals worked out again from its tiles. Null when
 * the delta changes a tile this board does not have and does not carry it whole: the board shown is
 * not the one the delta follows, so it is fetched again.
 */
export function foldDelta(farms: readonly FarmBoard[], delta: BoardDelta): FarmBoard[] | null {
  const byId = new Map(farms.map((f) => [f.farmId, f]));
  for (const change of delta.farms) {
    const before = byId.get(change.farmId);
    const removed = new Set(change.removedTankIds);
    const tiles = new Map((before?.tanks ?? []).filter((t) => !removed.has(t.tankId)).map((t) => [t.tankId, t]));
    for (const patch of change.tanks) {
      const tile = tiles.get(patch.tankId);
      if (tile) {
        tiles.set(patch.tankId, { ...tile, ...patch });
        continue;
      }
      const whole = tankTileSchema.safeParse(patch);
      if (!whole.success) return null;
      tiles.set(patch.tankId, whole.data);
    }
    const tanks = [...tiles.values()];
    if (tanks.length) byId.set(change.farmId, { farmId: change.farmId, name: change.name, totals: totalsOf(tanks), tanks });
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
