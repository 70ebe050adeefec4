import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import { totalsOf } from '@shared/board';
import type { BoardHistory, ContentsTotal, FarmBoard, StockBoard, TankTile } from '@shared/schemas';
import * as boardApi from '@/api/board';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';

function byName(a: FarmBoard, b: FarmBoard): number {
  return a.name.localeCompare(b.name);
}

/**
 * The stock board: every farm's tiles as the server last sent them (HTTP or socket), and totals
 * across farms recomputed from those tiles with the same shared function the server uses.
 */
export const useBoardStore = defineStore('board', () => {
  const farms = shallowRef<FarmBoard[]>([]);
  /** When the server built the whole board last; farm pushes since then are newer. */
  const generatedAt = ref<string | null>(null);
  /** When anything last arrived (whole board or one farm). */
  const updatedAt = ref<string | null>(null);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);

  const history = shallowRef<BoardHistory | null>(null);
  const historyStatus = ref<LoadStatus>('idle');
  const historyError = ref<string | null>(null);

  /** Whose board this is: a different person on the same device starts from nothing. */
  const userId = ref<number | null>(null);

  /** Bumped by every socket update, so an HTTP answer that was on its way does not undo a newer push. */
  let revision = 0;

  const tiles = computed<TankTile[]>(() => farms.value.flatMap((f) => f.tanks));
  const totals = computed<ContentsTotal[]>(() => totalsOf(tiles.value));
  const tileCount = computed(() => tiles.value.length);

  function applyBoard(board: StockBoard): void {
    revision++;
    farms.value = board.farms.slice().sort(byName);
    generatedAt.value = board.generatedAt;
    updatedAt.value = board.generatedAt;
    status.value = 'ready';
    error.value = null;
  }

  /** Replaces one farm (from a socket `board:farms` push); a farm that comes with no tanks leaves the board. */
  function applyFarm(farm: FarmBoard): void {
    revision++;
    const others = farms.value.filter((f) => f.farmId !== farm.farmId);
    const before = farms.value.find((f) => f.farmId === farm.farmId);
    // The server sends an empty name for a farm it could not find (archived meanwhile).
    const named = farm.name || !before ? farm : { ...farm, name: before.name };
    farms.value = farm.tanks.length ? [...others, named].sort(byName) : others;
    updatedAt.value = new Date().toISOString();
    if (status.value !== 'ready') {
      status.value = 'ready';
      error.value = null;
    }
  }

  async function load(): Promise<void> {
    const startedAt = revision;
    if (status.value !== 'ready') status.value = 'loading';
    error.value = null;
    try {
      const board = await boardApi.fetchBoard();
      if (revision === startedAt) applyBoard(board);
    } catch (e) {
      // A board already shown (from the socket) stays; the error only matters when there is none.
      if (status.value !== 'ready') {
        error.value = errorMessage(e);
        status.value = 'error';
      }
    }
  }

  async function loadHistory(): Promise<void> {
    if (historyStatus.value !== 'ready') historyStatus.value = 'loading';
    historyError.value = null;
    try {
      history.value = await boardApi.fetchBoardHistory();
      historyStatus.value = 'ready';
    } catch (e) {
      historyError.value = errorMessage(e);
      historyStatus.value = 'error';
    }
  }

  /** Keeps the board only when it belongs to `id`. */
  function claim(id: number): void {
    if (userId.value === id) return;
    reset();
    userId.value = id;
  }

  function reset(): void {
    revision++;
    farms.value = [];
    generatedAt.value = null;
    updatedAt.value = null;
    status.value = 'idle';
    error.value = null;
    history.value = null;
    historyStatus.value = 'idle';
    historyError.value = null;
    userId.value = null;
  }

  return {
    farms,
    generatedAt,
    updatedAt,
    status,
    error,
    history,
    historyStatus,
    historyError,
    tiles,
    totals,
    tileCount,
    applyBoard,
    applyFarm,
    load,
    loadHistory,
    claim,
    reset,
  };
});
