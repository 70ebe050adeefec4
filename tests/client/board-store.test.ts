import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { StockBoard } from '@shared/schemas';
import * as boardApi from '@/api/board';
import { useBoardStore } from '@/stores/board';
import { makeBoard, makeFarmBoard, makeTile } from './support/tanks';

vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));

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

  it('replaces one farm from a board:farms push and recomputes the totals across farms', () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([creek(), ridge()]));

    store.applyFarm(
      makeFarmBoard(12, 'Ridge block', [makeTile({ tankId: 4, code: 'RB-W1', capacityL: 5_000, usableCapacityL: 4_500, grossL: 4_000, usableL: 3_900, percentOfUsableCapacity: (3_900 / 4_500) * 100, takenAt: '2026-03-02T10:00:00.000Z' })]),
    );

    expect(store.farms).toHaveLength(2);
    expect(store.farms.find((f) => f.farmId === 12)!.tanks[0]!.usableL).toBe(3_900);
    expect(waterOf(store)).toMatchObject({ usableL: 5_500 + 900 + 3_900, grossL: 6_000 + 1_000 + 4_000, percentOfUsableCapacity: (10_300 / 18_000) * 100 });
    // The other farm's tiles are untouched.
    expect(store.farms.find((f) => f.farmId === 11)!.tanks.map((t) => t.code)).toEqual(['CS-W1', 'CS-W2', 'CS-F1']);
  });

  it('adds a farm it did not have, in name order', () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([ridge()]));

    store.applyFarm(creek());

    expect(store.farms.map((f) => f.farmId)).toEqual([11, 12]);
    expect(waterOf(store).tanks).toBe(3);
  });

  it('drops a farm that comes back with no tanks (archived meanwhile)', () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([creek(), ridge()]));

    store.applyFarm({ farmId: 11, name: '', totals: [], tanks: [] });

    expect(store.farms.map((f) => f.farmId)).toEqual([12]);
    expect(waterOf(store)).toMatchObject({ usableL: 2_400, tanks: 1 });
  });

  it('does not let an HTTP answer already on its way undo a newer push', async () => {
    let answer: (b: StockBoard) => void = () => undefined;
    api.fetchBoard.mockReturnValue(new Promise((resolve) => (answer = resolve)));
    const store = useBoardStore();

    const loading = store.load();
    store.applyFarm(makeFarmBoard(12, 'Ridge block', [makeTile({ tankId: 4, code: 'RB-W1', grossL: 4_000, usableL: 3_900, takenAt: '2026-03-02T10:00:00.000Z' })]));
    answer(makeBoard([creek(), ridge()]));
    await loading;

    expect(store.status).toBe('ready');
    expect(store.farms.map((f) => f.farmId)).toEqual([12]);
    expect(waterOf(store).usableL).toBe(3_900);
  });

  it('keeps a board shown when a later reload fails', async () => {
    const store = useBoardStore();
    store.applyBoard(makeBoard([creek()]));
    api.fetchBoard.mockRejectedValue(new Error('Cannot reach the server.'));

    await store.load();

    expect(store.status).toBe('ready');
    expect(store.farms).toHaveLength(1);
  });

  it('shows the error when the first load fails', async () => {
    api.fetchBoard.mockRejectedValue(new Error('The server is not answering.'));
    const store = useBoardStore();

    await store.load();

    expect(store.status).toBe('error');
    expect(store.error).toBe('The server is not answering.');
  });

  it('forgets the board when another person claims it', () => {
    const store = useBoardStore();
    store.claim(2);
    store.applyBoard(makeBoard([creek()]));

    store.claim(2);
    expect(store.farms).toHaveLength(1);
    store.claim(4);
    expect(store.farms).toHaveLength(0);
    expect(store.status).toBe('idle');
  });
});
