import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import { totalsOf } from '@shared/board';
import { BOARD_DELTA_VERSION, boardDeltaSchema, type BoardDelta, type BoardHistory, type BoardStreamPosition, type ContentsTotal, type FarmBoard, type StockBoard, type TankTile } from '@shared/schemas';
import * as boardApi from '@/api/board';
import { errorMessage } from '@/api/http';
import { byFarmName, foldDelta, followingDeltas } from './board-delta';
import type { LoadStatus } from './farms';

/**
 * The stock board: every farm's tiles as the server last sent them (GET /api/board, then the numbered
 * socket deltas that follow it), and totals across farms recomputed from those tiles with the same
 * shared function the server uses. Deltas are applied in order; on a gap, a reconnection or another
 * stream (server restarted, other delta version) the board is fetched again, once, with its entity tag.
 */
export const useBoardStore = defineStore('board', () => {
  const farms = shallowRef<FarmBoard[]>([]);
  /** When the server built the whole board last. */
  const generatedAt = ref<string | null>(null);
  /** When anything last arrived (whole board or a delta). */
  const updatedAt = ref<string | null>(null);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);
  /** The stream position applied: the board's, then each delta's in turn. */
  const stream = shallowRef<BoardStreamPosition | null>(null);
  /** How many times the board was fetched again because of a gap, a reconnection or another stream. */
  const refetches = ref(0);

  const history = shallowRef<BoardHistory | null>(null);
  const historyStatus = ref<LoadStatus>('idle');
  const historyError = ref<string | null>(null);

  /** The last board fetched and its entity tag: a 304 answer means it is still the server's. */
  let fetched: { board: StockBoard; etag: string } | null = null;
  /** The fetch under way; deltas that arrive meanwhile wait in `waiting`. */
  let fetching: Promise<void> | null = null;
  let waiting: BoardDelta[] = [];
  /** Bumped by reset(), so an answer for the previous person is dropped. */
  let owner = 0;

  const tiles = computed<TankTile[]>(() => farms.value.flatMap((f) => f.tanks));
  const totals = computed<ContentsTotal[]>(() => totalsOf(tiles.value));
  const tileCount = computed(() => tiles.value.length);

  function applyBoard(board: StockBoard): void {
    farms.value = board.farms.slice().sort(byFarmName);
    generatedAt.value = board.generatedAt;
    updatedAt.value = board.generatedAt;
    stream.value = board.stream;
    status.value = 'ready';
    error.value = null;
  }

  /** Applies the next delta of the stream; false when it does not fit the board shown (fetch again). */
  function applyInOrder(delta: BoardDelta): boolean {
    const folded = foldDelta(farms.value, delta);
    if (!folded) return false;
    farms.value = folded;
    stream.value = { version: delta.version, epoch: delta.epoch, seq: delta.seq };
    updatedAt.value = delta.generatedAt;
    return true;
  }

  /**
   * Takes one socket delta: applied when it is the next of the stream, ignored when already
   * included, kept while the board is being fetched; otherwise (a gap, another stream or version,
   * or a message that is not a delta) the board is fetched again.
   */
  function applyDelta(message: unknown): void {
    const parsed = boardDeltaSchema.safeParse(message);
    if (!parsed.success) return void refetch();
    const delta = parsed.data;
    if (fetching || !stream.value) {
      waiting.push(delta);
      return;
    }
    const at = stream.value;
    if (delta.version !== BOARD_DELTA_VERSION || delta.epoch !== at.epoch) return void refetch();
    if (delta.seq <= at.seq) return;
    if (delta.seq !== at.seq + 1) {
      waiting.push(delta);
      return void refetch();
    }
    if (!applyInOrder(delta)) void refetch();
  }

  /** The stream position the socket was last told on connecting, and whether it has connected since the board was first fetched. */
  let told: BoardStreamPosition | null = null;
  let connectedOnce = false;

  /** The socket (re)connected and is in its rooms: pushes sent while it was away are lost, so the board is fetched. */
  function connected(position: BoardStreamPosition): void {
    told = position;
    const first = !connectedOnce;
    connectedOnce = true;
    // A fetch under way is checked against `told` when it ends.
    if (fetching) return;
    // The first connection, when the board shown is already at that very position: nothing to fetch.
    const at = stream.value;
    if (first && at && at.epoch === position.epoch && at.version === position.version && at.seq === position.seq) return;
    void refetch();
  }

  function refetch(): Promise<void> {
    if (fetching) return fetching;
    refetches.value++;
    return load();
  }

  /** Fetches the board (with the tag of the last one), then applies the deltas that came meanwhile. */
  function load(): Promise<void> {
    if (fetching) return fetching;
    const mine = owner;
    if (status.value !== 'ready') status.value = 'loading';
    error.value = null;
    let run: Promise<void> | null = null;
    run = (async () => {
      try {
        const answer = await boardApi.fetchBoardIfChanged(fetched?.etag ?? null);
        if (mine !== owner) return;
        const board = answer.notModified && fetched ? fetched.board : (answer as { body: StockBoard }).body;
        if (!answer.notModified) fetched = answer.etag ? { board, etag: answer.etag } : null;
        applyBoard(board);
        const following = followingDeltas(waiting, board.stream.epoch, board.stream.seq);
        waiting = [];
        // A delta that does not fit the board (a tile it changes is not there) leaves a gap too.
        const gap = following.gap || !following.next.every((d) => applyInOrder(d));
        fetching = null;
        // Something was lost in between (a delta missing, or the socket was told of a later one than the board and the deltas reach): fetch once more.
        const behind = told !== null && told.epoch === board.stream.epoch && told.seq > stream.value!.seq;
        // Once per connection, so a board kept a little behind on the server cannot make this loop.
        if (behind) told = null;
        if (gap || behind) void refetch();
      } catch (e) {
        if (mine !== owner) return;
        // A board already shown stays; the error only matters when there is none.
        if (status.value !== 'ready') {
          error.value = errorMessage(e);
          status.value = 'error';
        }
      } finally {
        if (fetching === run) fetching = null;
      }
    })();
    fetching = run;
    return run;
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

  function reset(): void {
    owner++;
    fetched = null;
    fetching = null;
    waiting = [];
    told = null;
    connectedOnce = false;
    stream.value = null;
    farms.value = [];
    generatedAt.value = null;
    updatedAt.value = null;
    status.value = 'idle';
    error.value = null;
    history.value = null;
    historyStatus.value = 'idle';
    historyError.value = null;
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
    stream,
    refetches,
    applyBoard,
    applyDelta,
    connected,
    load,
    loadHistory,
    reset,
  };
});
