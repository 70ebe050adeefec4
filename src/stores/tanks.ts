import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type { Tank, TankCalibrationVersion, TankContentsPeriod, TankCreateInput, TankTile, TankUpdateInput } from '@shared/schemas';
import * as tanksApi from '@/api/tanks';
import type { TankForecast } from '@/api/tanks';
import * as boardApi from '@/api/board';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';

/** Walking order as the server sorts it: walkOrder, then name. */
function inWalkingOrder(a: Tank, b: Tank): number {
  return a.walkOrder - b.walkOrder || a.name.localeCompare(b.name);
}

/** Tanks by farm, each tank's contents history and its latest reading from the stock board. */
export const useTanksStore = defineStore('tanks', () => {
  /** Every tank loaded so far, of any farm. */
  const tanks = shallowRef<Tank[]>([]);
  const farmStatus = ref<Record<number, LoadStatus>>({});
  const farmError = ref<Record<number, string | null>>({});
  const contents = shallowRef<Record<number, TankContentsPeriod[]>>({});
  /** The latest reading of each tank (board tiles by tank id). */
  const latest = shallowRef<Record<number, TankTile>>({});
  const latestStatus = ref<LoadStatus>('idle');
  /** Each tank's forecast (use rate, days of cover, suspected leaks) as last fetched, by tank id. */
  const forecasts = shallowRef<Record<number, TankForecast>>({});
  const forecastStatus = ref<Record<number, LoadStatus>>({});
  const forecastError = ref<Record<number, string | null>>({});
  /** Each tank's calibrations, numbered in the order they were made, oldest first, by tank id. */
  const calibrations = shallowRef<Record<number, TankCalibrationVersion[]>>({});
  const calibrationsStatus = ref<Record<number, LoadStatus>>({});

  const byId = computed(() => new Map(tanks.value.map((t) => [t.id, t])));

  /** The farm's active tanks in walking order. */
  function tanksOf(farmId: number): Tank[] {
    return tanks.value.filter((t) => t.farmId === farmId && t.archivedAt === null).sort(inWalkingOrder);
  }

  function statusOf(farmId: number): LoadStatus {
    return farmStatus.value[farmId] ?? 'idle';
  }

  function put(tank: Tank): Tank {
    tanks.value = [...tanks.value.filter((t) => t.id !== tank.id), tank];
    return tank;
  }

  async function loadFarm(farmId: number): Promise<void> {
    farmStatus.value = { ...farmStatus.value, [farmId]: 'loading' };
    farmError.value = { ...farmError.value, [farmId]: null };
    try {
      const fresh = await tanksApi.fetchTanks({ farmId, includeArchived: true });
      tanks.value = [...tanks.value.filter((t) => t.farmId !== farmId), ...fresh];
      farmStatus.value = { ...farmStatus.value, [farmId]: 'ready' };
    } catch (e) {
      farmError.value = { ...farmError.value, [farmId]: errorMessage(e) };
      farmStatus.value = { ...farmStatus.value, [farmId]: 'error' };
    }
  }

  /** Fetches one tank (the tank page); throws ApiError so the page can tell 404 from a failure. */
  async function loadTank(tankId: number): Promise<Tank> {
    return put(await tanksApi.fetchTank(tankId));
  }

  /** The latest reading of every tank the user may see, from the stock board. */
  async function loadLatest(): Promise<void> {
    latestStatus.value = 'loading';
    try {
      const board = await boardApi.fetchBoard();
      latest.value = Object.fromEntries(board.farms.flatMap((f) => f.tanks).map((tile) => [tile.tankId, tile]));
      latestStatus.value = 'ready';
    } catch {
      // The cards still show every tank without its level; the board page reports the failure.
      latestStatus.value = 'error';
    }
  }

  /** Fetches a tank's forecast; a forecast already shown stays on screen while the new one loads. */
  async function loadForecast(tankId: number): Promise<void> {
    forecastStatus.value = { ...forecastStatus.value, [tankId]: 'loading' };
    forecastError.value = { ...forecastError.value, [tankId]: null };
    try {
      const forecast = await tanksApi.fetchForecast(tankId);
      forecasts.value = { ...forecasts.value, [tankId]: forecast };
      forecastStatus.value = { ...forecastStatus.value, [tankId]: 'ready' };
    } catch (e) {
      forecastError.value = { ...forecastError.value, [tankId]: errorMessage(e) };
      forecastStatus.value = { ...forecastStatus.value, [tankId]: 'error' };
    }
  }

  /** Fetches a tank's numbered calibrations; a list already shown stays while the new one loads. */
  async function loadCalibrations(tankId: number): Promise<void> {
    calibrationsStatus.value = { ...calibrationsStatus.value, [tankId]: 'loading' };
    try {
      const list = await tanksApi.fetchCalibrations(tankId);
      calibrations.value = { ...calibrations.value, [tankId]: list };
      calibrationsStatus.value = { ...calibrationsStatus.value, [tankId]: 'ready' };
    } catch {
      // The page then names no version; the calibration table and the readings still load on their own.
      calibrationsStatus.value = { ...calibrationsStatus.value, [tankId]: 'error' };
    }
  }

  /** The walkOrder a new tank of this farm gets so it comes last on the round. */
  function nextWalkOrder(farmId: number): number {
    return tanksOf(farmId).reduce((last, t) => Math.max(last, t.walkOrder), 0) + 1;
  }

  async function create(input: TankCreateInput): Promise<Tank> {
    return put(await tanksApi.createTank(input));
  }

  async function update(tankId: number, input: TankUpdateInput): Promise<Tank> {
    const tank = put(await tanksApi.updateTank(tankId, input));
    // New contents open a new period; the cached history is stale.
    if (input.contents !== undefined || input.contentsNote !== undefined || input.specificGravity !== undefined) {
      const { [tankId]: _stale, ...rest } = contents.value;
      contents.value = rest;
    }
    return tank;
  }

  /**
   * Moves a tank one place earlier (-1) or later (+1) on its farm's round, then numbers the farm's
   * tanks 1, 2, 3… and saves each walkOrder that changed. On a failure the farm is reloaded.
   */
  async function move(tankId: number, direction: -1 | 1): Promise<void> {
    const tank = byId.value.get(tankId);
    if (!tank) return;
    const order = tanksOf(tank.farmId);
    const from = order.findIndex((t) => t.id === tankId);
    const to = from + direction;
    if (from < 0 || to < 0 || to >= order.length) return;
    [order[from], order[to]] = [order[to], order[from]];
    const changes = order.map((t, index) => ({ tank: t, walkOrder: index + 1 })).filter((c) => c.tank.walkOrder !== c.walkOrder);
    // Shown at once; the server's answers replace these copies.
    for (const c of changes) put({ ...c.tank, walkOrder: c.walkOrder });
    try {
      for (const c of changes) put(await tanksApi.updateTank(c.tank.id, { walkOrder: c.walkOrder }));
    } catch (e) {
      await loadFarm(tank.farmId);
      throw e;
    }
  }

  async function loadContents(tankId: number): Promise<TankContentsPeriod[]> {
    const periods = await tanksApi.fetchContentsHistory(tankId);
    contents.value = { ...contents.value, [tankId]: periods };
    return periods;
  }

  function reset(): void {
    tanks.value = [];
    farmStatus.value = {};
    farmError.value = {};
    contents.value = {};
    latest.value = {};
    latestStatus.value = 'idle';
    forecasts.value = {};
    forecastStatus.value = {};
    forecastError.value = {};
    calibrations.value = {};
    calibrationsStatus.value = {};
  }

  return {
    tanks,
    farmStatus,
    farmError,
    contents,
    latest,
    latestStatus,
    forecasts,
    forecastStatus,
    forecastError,
    calibrations,
    calibrationsStatus,
    byId,
    tanksOf,
    statusOf,
    loadFarm,
    loadTank,
    loadLatest,
    loadForecast,
    loadCalibrations,
    nextWalkOrder,
    create,
    update,
    move,
    loadContents,
    reset,
  };
});
