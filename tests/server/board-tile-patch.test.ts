// What a board delta carries of a tile (server/services/board-deltas.ts): the fields that changed since
// it was last sent, the whole tile when it was not sent before, nothing when only the days of cover
// moved (they count down with the clock), and the days of cover along with any other change.
import { describe, expect, it } from 'vitest';
import { tankTileSchema } from '@shared/schemas';
import { tilePatch } from '../../server/services/board-deltas';
import { makeTile } from '../client/support/tanks';

const sent = makeTile({ tankId: 7, code: 'DP-W1', grossL: 4_000, usableL: 3_800, percentOfUsableCapacity: 40, levelMm: 900, takenAt: '2026-06-01T07:00:00.000Z', useLPerDay: 200, daysOfCover: 19 });

describe('tilePatch', () => {
  it('is the whole tile when the tile was not sent before', () => {
    const patch = tilePatch(undefined, sent);
    expect(patch).toEqual(sent);
    expect(tankTileSchema.safeParse(patch).success).toBe(true);
  });

  it('is null when nothing changed, and when only the days of cover counted down', () => {
    expect(tilePatch(sent, { ...sent })).toBeNull();
    expect(tilePatch(sent, { ...sent, daysOfCover: 18.5 })).toBeNull();
  });

  it('carries the id and only the fields a new reading changed, with the days of cover that moved along', () => {
    const read = { ...sent, grossL: 3_500, usableL: 3_300, percentOfUsableCapacity: 35, levelMm: 820, takenAt: '2026-06-02T07:00:00.000Z', daysOfCover: 16.5 };
    expect(tilePatch(sent, read)).toEqual({ tankId: 7, grossL: 3_500, usableL: 3_300, percentOfUsableCapacity: 35, levelMm: 820, takenAt: '2026-06-02T07:00:00.000Z', daysOfCover: 16.5 });
    // Laid over what was sent, the patch gives the tile now.
    expect({ ...sent, ...tilePatch(sent, read) }).toEqual(read);
  });

  it('carries a figure that became none as null, so the receiver clears it', () => {
    expect(tilePatch(sent, { ...sent, useLPerDay: null, daysOfCover: null })).toEqual({ tankId: 7, useLPerDay: null, daysOfCover: null });
  });
});
