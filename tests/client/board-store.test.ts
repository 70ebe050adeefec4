import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { BOARD_DELTA_VERSION, type BoardDelta, type StockBoard, type TankTile, type TankTilePatch } from '@shared/schemas';
import type { ConditionalAnswer } from '@/api/http';
import * as boardApi from '@/api/board';
import { useBoardStore } from '@/stores/board';
import { makeBoard, makeFarmBoard, makeTile } from './support/tanks';

vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardIfChanged: vi.fn(), fetchBoardHistory: vi.fn() }));

const api = vi.mocked(boardApi);

// Two invented farms. Creek site: two water tanks read, one fertilizer tank never read.
// Ridge block: one water tank. Figures in litres, chosen so the sums are easy to check by hand.
const creek = () =>
  makeFarmBoard(11, 'Creek site', [
    makeTile({ tankId: 1, code: 'CS-W1', capacityL: 10_000, usableCapacityL: 9_000, grossL: 6_000, usableL: 5_500, percentOfUsableCapacity: (5_500 / 9_000) * 100, takenAt: '2026-03-02T08:00:00.000Z' }),
    makeTile({ tankId: 2, code: 'CS-W2', capacityL: 5_000, usableCapacityL: 4_500, grossL: 1_000, usableL: 900, percentOfUsableCapacity: 20, takenAt: '2026-03-01T08:00:00.000Z' }),
    makeTile({ tankId: 3, code: 'CS-F1', contents: 'fertilizer', capacityL: 1_000 }),
  ]);
const ridge = () =>
  makeFarmBoard(12, 'Ridge block', [makeTile({ tankId: 4, code: 'RB-W1', capacityL: 5_000, usableCapacityL: 4_500, grossL: 2_500, usableL: 2_400, percentOfUsableCapacity: (2_400 / 4_500) * 100, takenAt: '2026-03-02T07:30:00.000Z' })]);

const ridgeTile = (grossL: number, usableL: number): TankTile =>
  makeTile({ tankId: 4, code: 'RB-W1', capacityL: 5_000, usableCapacityL: 4_500, grossL, usableL, percentOfUsableCapacity: (usableL / 4_500) * 100, takenAt: '2026-03-02T10:00:00.000Z' });

/** A delta of the test stream: each farm with its tiles whole or as changed fields (the store works out every total). */
function delta(seq: number, farms: { farmId: number; name: string; tanks: TankTilePatch[]; removedTankIds?: number[] }[]): BoardDelta {
  return {
    version: BOARD_DELTA_VERSION,
    epoch: 'test-epoch',
    seq,
    generatedAt: '2026-03-02T10:00:01.000Z',
    farms: farms.map((f) => ({ removedTankIds: [], ...f })),
    removedFarmIds: [],
  };
}

const answer = (board: StockBoard, etag: string): ConditionalAnswer<StockBoard> => ({ notModified: false, body: board, etag });

const waterOf = (store: ReturnType<typeof useBoardStore>) => store.totals.find((t) => t.contents === 'water')!;

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
});

describe('useBoardStore', () => {
  it('totals every farm’s tiles by contents', () => {
    const store = useBoardStore();

    store.applyBoard(makeBoard([ridge(), creek()]));

    expect(store.farms.map((f) => f.name)).toEqual(['Creek site', 'Ridge block']);
    expect(waterOf(store)).toMatchObject({
      usableL: 5_500 + 900 + 2_400,
      grossL: 6_000 + 1_000 + 2_500,
      capacityL: 20_000,
      // Usable litres of the usable capacity (outlet to fill line) of the tanks read, not gross of the brim-full capacity.
      usableCapacityL: 18_000,
      percentOfUsableCapacity: (8_800 / 18_000) * 100,
      tanks: 3,
      tanksWithoutReading: 0,
      oldestReadingAt: '2026-03-01T08:00:00.000Z',
    });
    expect(store.totals.find((t) => t.contents === 'fertilizer')).toMatchObject({ tanks: 1, tanksWithoutReading: 1, usableL: 0, oldestReadingAt: null });
  });

  it('replaces a changed tile from a delta, keeps the farm\'s other tiles and recomputes the totals across farms', () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([creek(), ridge()], undefined, 4));

    store.applyDelta(delta(5, [{ farmId: 12, name: 'Ridge block', tanks: [ridgeTile(4_000, 3_900)] }]));

    expect(store.stream!.seq).toBe(5);
    expect(store.farms.find((f) => f.farmId === 12)!.tanks[0]!.usableL).toBe(3_900);
    expect(waterOf(store)).toMatchObject({ usableL: 5_500 + 900 + 3_900, grossL: 6_000 + 1_000 + 4_000, percentOfUsableCapacity: (10_300 / 18_000) * 100 });
    expect(store.farms.find((f) => f.farmId === 11)!.tanks.map((t) => t.code)).toEqual(['CS-W1', 'CS-W2', 'CS-F1']);
  });

  it('lays a tile\'s changed fields over it and works the farm\'s totals out again from its tiles', () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([creek(), ridge()], undefined, 4));

    // Only the reading's fields of CS-W2 changed: name, code, capacities stay as the board had them.
    store.applyDelta(delta(5, [{ farmId: 11, name: 'Creek site', tanks: [{ tankId: 2, grossL: 4_000, usableL: 3_800, percentOfUsableCapacity: (3_800 / 4_500) * 100, takenAt: '2026-03-02T10:00:00.000Z' }] }]));

    const creekNow = store.farms.find((f) => f.farmId === 11)!;
    expect(creekNow.tanks.find((t) => t.tankId === 2)).toMatchObject({ code: 'CS-W2', capacityL: 5_000, usableCapacityL: 4_500, grossL: 4_000, usableL: 3_800, takenAt: '2026-03-02T10:00:00.000Z' });
    // The farm's own totals (shown on its row) follow its tiles, as the server works them out for GET /api/board.
    expect(creekNow.totals.find((t) => t.contents === 'water')).toMatchObject({ usableL: 5_500 + 3_800, grossL: 6_000 + 4_000, tanks: 2, oldestReadingAt: '2026-03-02T08:00:00.000Z' });
    expect(waterOf(store).usableL).toBe(5_500 + 3_800 + 2_400);
    expect(api.fetchBoardIfChanged).not.toHaveBeenCalled();
  });

  it('fetches the board again when a delta changes a tile it does not have and does not carry it whole', async () => {
    api.fetchBoardIfChanged.mockResolvedValue(answer(makeBoard([creek(), ridge()], undefined, 5), '"board-a"'));
    const store = useBoardStore();
    store.applyBoard(makeBoard([ridge()], undefined, 4));

    store.applyDelta(delta(5, [{ farmId: 11, name: 'Creek site', tanks: [{ tankId: 2, usableL: 3_800 }] }]));

    expect(api.fetchBoardIfChanged).toHaveBeenCalledTimes(1);
    await vi.waitFor(() => expect(store.tiles.map((t) => t.tankId)).toEqual([1, 2, 3, 4]));
    expect(store.tiles.find((t) => t.tankId === 2)!.usableL).toBe(900);
  });

  it('adds a farm it did not have, in name order, and drops tanks and farms that left', () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([ridge()], undefined, 0));

    store.applyDelta(delta(1, [{ farmId: 11, name: 'Creek site', tanks: creek().tanks }]));
    expect(store.farms.map((f) => f.farmId)).toEqual([11, 12]);
    store.applyDelta({ ...delta(2, [{ farmId: 11, name: 'Creek site', tanks: [], removedTankIds: [2] }]), removedFarmIds: [12] });

    expect(store.farms.map((f) => f.farmId)).toEqual([11]);
    expect(store.tiles.map((t) => t.tankId)).toEqual([1, 3]);
  });

  it('ignores a delta the board already includes', () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([ridge()], undefined, 7));

    store.applyDelta(delta(7, [{ farmId: 12, name: 'Ridge block', tanks: [ridgeTile(10, 9)] }]));

    expect(store.tiles[0]!.usableL).toBe(2_400);
    expect(api.fetchBoardIfChanged).not.toHaveBeenCalled();
  });

  it('fetches the board once with its entity tag on a gap, then applies what came after it in order', async () => {
    api.fetchBoardIfChanged.mockResolvedValueOnce(answer(makeBoard([creek(), ridge()], undefined, 1), '"board-a"'));
    const store = useBoardStore();
    await store.load();
    let reply: (a: ConditionalAnswer<StockBoard>) => void = () => undefined;
    api.fetchBoardIfChanged.mockReturnValueOnce(new Promise((resolve) => (reply = resolve)));

    // Delta 2 is lost; 3 shows the gap, 4 arrives while the board is on its way.
    store.applyDelta(delta(3, [{ farmId: 12, name: 'Ridge block', tanks: [ridgeTile(3_000, 2_900)] }]));
    store.applyDelta(delta(4, [{ farmId: 12, name: 'Ridge block', tanks: [ridgeTile(3_500, 3_400)] }]));
    expect(api.fetchBoardIfChanged).toHaveBeenCalledTimes(2);
    expect(api.fetchBoardIfChanged).toHaveBeenLastCalledWith('"board-a"');
    const ridgeAt3 = makeFarmBoard(12, 'Ridge block', [ridgeTile(3_000, 2_900)]);
    reply(answer(makeBoard([creek(), ridgeAt3], undefined, 3), '"board-b"'));
    await vi.waitFor(() => expect(store.stream!.seq).toBe(4));

    expect(store.refetches).toBe(1);
    expect(api.fetchBoardIfChanged).toHaveBeenCalledTimes(2);
    expect(waterOf(store).usableL).toBe(5_500 + 900 + 3_400);
  });

  it('keeps its board when the server answers 304 to a fetch after a reconnection', async () => {
    api.fetchBoardIfChanged.mockResolvedValueOnce(answer(makeBoard([creek()], undefined, 2), '"board-a"'));
    const store = useBoardStore();
    await store.load();
    store.connected({ version: BOARD_DELTA_VERSION, epoch: 'test-epoch', seq: 2 });
    expect(api.fetchBoardIfChanged).toHaveBeenCalledTimes(1);
    api.fetchBoardIfChanged.mockResolvedValueOnce({ notModified: true, etag: '"board-a"' });

    store.connected({ version: BOARD_DELTA_VERSION, epoch: 'test-epoch', seq: 2 });
    await vi.waitFor(() => expect(api.fetchBoardIfChanged).toHaveBeenCalledTimes(2));

    expect(api.fetchBoardIfChanged).toHaveBeenLastCalledWith('"board-a"');
    await vi.waitFor(() => expect(store.refetches).toBe(1));
    expect(store.tiles.map((t) => t.tankId)).toEqual([1, 2, 3]);
  });

  it.each([
    ['another epoch (the server restarted)', { epoch: 'other-epoch' }],
    ['another delta version', { version: BOARD_DELTA_VERSION + 1 }],
    ['a message that is not a delta', { farms: 'nope' }],
  ])('fetches the board again on %s', async (_, change) => {
    api.fetchBoardIfChanged.mockResolvedValue(answer(makeBoard([ridge()], undefined, 1), '"board-a"'));
    const store = useBoardStore();
    await store.load();

    store.applyDelta({ ...delta(2, []), ...change });

    expect(api.fetchBoardIfChanged).toHaveBeenCalledTimes(2);
    await vi.waitFor(() => expect(store.refetches).toBe(1));
  });

  it('does not let an HTTP answer already on its way undo a newer delta', async () => {
    let reply: (a: ConditionalAnswer<StockBoard>) => void = () => undefined;
    api.fetchBoardIfChanged.mockReturnValue(new Promise((resolve) => (reply = resolve)));
    const store = useBoardStore();

    const loading = store.load();
    store.applyDelta(delta(6, [{ farmId: 12, name: 'Ridge block', tanks: [ridgeTile(4_000, 3_900)] }]));
    reply(answer(makeBoard([creek(), ridge()], undefined, 5), '"board-a"'));
    await loading;

    expect(store.status).toBe('ready');
    expect(store.stream!.seq).toBe(6);
    expect(waterOf(store).usableL).toBe(5_500 + 900 + 3_900);
  });

  it('keeps a board shown when a later reload fails', async () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([creek()]));
    api.fetchBoardIfChanged.mockRejectedValue(new Error('Cannot reach the server.'));

    await store.load();

    expect(store.status).toBe('ready');
    expect(store.farms).toHaveLength(1);
  });

  it('shows the error when the first load fails', async () => {
    api.fetchBoardIfChanged.mockRejectedValue(new Error('The server is not answering.'));
    const store = useBoardStore();

    await store.load();

    expect(store.status).toBe('error');
    expect(store.error).toBe('The server is not answering.');
  });
});
