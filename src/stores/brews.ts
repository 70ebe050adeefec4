import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import { levelAtVolume } from '@shared/calibration';
import { batchFit, batchVolumeL, inputShortfalls, type BatchFit, type InputShortfall } from '@shared/mixing';
import { tankVolumes } from '@shared/readings';
import type { Brew, BrewCreateInput, BrewKind, BrewStatus, InputStatus, Tank, TankTile } from '@shared/schemas';
import { displayUnits, toSI, type UnitSystem } from '@shared/units';
import * as boardApi from '@/api/board';
import * as brewsApi from '@/api/brews';
import { errorMessage } from '@/api/http';
import * as inventoryApi from '@/api/inventory';
import * as tanksApi from '@/api/tanks';
import type { LoadStatus } from './farms';
import { useSessionStore } from './session';

/** The list's filters; null shows all. */
export interface BrewListFilter {
  farmId: number | null;
  status: BrewStatus | null;
}

/** A new brew as the form holds it: volumes in the user's display unit, input quantities in each input's unit. */
export interface BrewDraft {
  tankId: number;
  kind: BrewKind;
  name: string;
  startedAt?: string;
  readyAt?: string | null;
  /** Water added, in the user's volume unit (L or US gal). */
  waterVolume: number;
  dilution: { n: number; convention: 'parts-water' | 'parts-total' } | null;
  notes: string;
  inputs: { inputId: number; quantity: number }[];
}

/** What the tank holds by its latest reading (L), and the room left to its safe fill line (L). */
export interface TankFill {
  grossL: number;
  ullageL: number;
  takenAt: string | null;
}

/** A form line of the new-brew form: an input and its quantity in the input's unit, either still empty. */
export interface BrewLineDraft {
  inputId: number | null;
  quantity: number | null;
}

/** An input the brew takes more of than the farm holds, with its name and unit for the words. */
export interface NamedShortfall extends InputShortfall {
  name: string;
  unit: string;
}

/** Brews of the user's farms, and the tanks, inputs and latest tank volumes the new-brew form needs. */
export const useBrewsStore = defineStore('brews', () => {
  const brews = shallowRef<Brew[]>([]);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);
  const filter = ref<BrewListFilter>({ farmId: null, status: null });

  const tanksByFarm = shallowRef<Map<number, Tank[]>>(new Map());
  const inputsByFarm = shallowRef<Map<number, InputStatus[]>>(new Map());
  const tiles = shallowRef<Map<number, TankTile>>(new Map());
  const optionsStatus = ref<LoadStatus>('idle');
  const optionsError = ref<string | null>(null);

  const unitSystem = computed<UnitSystem>(() => useSessionStore().user?.unitSystem ?? 'metric');

  async function load(): Promise<void> {
    status.value = 'loading';
    error.value = null;
    try {
      brews.value = await brewsApi.fetchBrews({ farmId: filter.value.farmId ?? undefined, status: filter.value.status ?? undefined });
      status.value = 'ready';
    } catch (e) {
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  function setFilter(next: Partial<BrewListFilter>): Promise<void> {
    filter.value = { ...filter.value, ...next };
    return load();
  }

  /** Loads the tanks and inputs of one farm, and the board's latest volumes, for the new-brew form. */
  async function loadFarmOptions(farmId: number): Promise<void> {
    optionsStatus.value = 'loading';
    optionsError.value = null;
    try {
      const [tanks, inputs, board] = await Promise.all([
        tanksApi.fetchTanks({ farmId }),
        inventoryApi.fetchInputs({ farmId }),
        boardApi.fetchBoard(),
      ]);
      tanksByFarm.value = new Map(tanksByFarm.value).set(farmId, tanks.filter((t) => t.archivedAt === null));
      inputsByFarm.value = new Map(inputsByFarm.value).set(farmId, inputs.filter((i) => i.archivedAt === null));
      tiles.value = new Map(board.farms.flatMap((f) => f.tanks).map((t) => [t.tankId, t]));
      optionsStatus.value = 'ready';
    } catch (e) {
      optionsError.value = errorMessage(e);
      optionsStatus.value = 'error';
    }
  }

  function tanksOf(farmId: number | null): Tank[] {
    return farmId === null ? [] : (tanksByFarm.value.get(farmId) ?? []);
  }

  function inputsOf(farmId: number | null): InputStatus[] {
    return farmId === null ? [] : (inputsByFarm.value.get(farmId) ?? []);
  }

  /**
   * The tank's latest gross volume and its ullage to the safe fill line, from the board tile and the
   * tank's calibration (shared functions, as the server computes them); null before any reading.
   */
  function tankFill(tank: Tank): TankFill | null {
    const tile = tiles.value.get(tank.id);
    if (!tile || tile.grossL === null) return null;
    try {
      const levelMm = levelAtVolume(tank.geometry, tile.grossL);
      const v = tankVolumes(tank.geometry, levelMm, { outletHeightMm: tank.outletHeightMm, safeFillLevelMm: tank.safeFillLevelMm });
      return { grossL: v.grossL, ullageL: v.ullageL, takenAt: tile.takenAt };
    } catch {
      return null;
    }
  }

  const filledLines = (lines: readonly BrewLineDraft[]) =>
    lines.flatMap((l) => (l.inputId !== null && typeof l.quantity === 'number' && Number.isFinite(l.quantity) && l.quantity >= 0 ? [{ inputId: l.inputId, quantity: l.quantity }] : []));

  function fitIn(tank: Tank, batchL: () => number, startedAt: Date | null): BatchFit | null {
    const tile = tiles.value.get(tank.id);
    try {
      return batchFit({
        geometry: tank.geometry,
        safeFillLevelMm: tank.safeFillLevelMm,
        latest: tile && tile.grossL !== null && tile.takenAt ? { grossL: tile.grossL, takenAt: tile.takenAt } : null,
        startedAt: (startedAt ?? new Date()).toISOString(),
        batchL: batchL(),
      });
    } catch {
      return null;
    }
  }

  /**
   * Whether the form's batch (water typed in the user's unit plus the inputs counted by volume) fits
   * the tank below its safe fill line, by the shared check against the board's latest reading; null
   * while the water is not a number.
   */
  function batchFitOf(tank: Tank, waterVolume: number | null, lines: readonly BrewLineDraft[], startedAt: Date | null): BatchFit | null {
    if (typeof waterVolume !== 'number' || !Number.isFinite(waterVolume) || waterVolume < 0) return null;
    const units = new Map(inputsOf(tank.farmId).map((i) => [i.id, i.unit]));
    const waterL = toSI(waterVolume, displayUnits(unitSystem.value).volume);
    return fitIn(tank, () => batchVolumeL(waterL, filledLines(lines).map((l) => ({ quantity: l.quantity, unit: units.get(l.inputId) ?? '' }))), startedAt);
  }

  /** Whether the calculator's amounts (water and concentrate, L) fit the tank below its safe fill line. */
  function mixFitOf(tank: Tank, amounts: { waterL: number; concentrateL: number }, startedAt: Date | null): BatchFit | null {
    return fitIn(tank, () => batchVolumeL(amounts.waterL, [{ quantity: amounts.concentrateL, unit: 'L' }]), startedAt);
  }

  /** The inputs the form's lines take more of than the farm's stock on hand, each with how much is missing. */
  function shortfallsOf(farmId: number | null, lines: readonly BrewLineDraft[]): NamedShortfall[] {
    const inputs = new Map(inputsOf(farmId).map((i) => [i.id, i]));
    const onHand = new Map([...inputs.values()].map((i) => [i.id, i.onHand]));
    return inputShortfalls(filledLines(lines), onHand).map((s) => ({ ...s, name: inputs.get(s.inputId)?.name ?? '', unit: inputs.get(s.inputId)?.unit ?? '' }));
  }

  function put(brew: Brew): Brew {
    const others = brews.value.filter((b) => b.id !== brew.id);
    brews.value = [...others, brew].sort((a, b) => b.startedAt.localeCompare(a.startedAt) || b.id - a.id);
    return brew;
  }

  /** The body POST /api/brews takes: the draft's water converted from the user's unit to litres. */
  function toCreateInput(draft: BrewDraft): BrewCreateInput {
    const { waterVolume, ...rest } = draft;
    return { ...rest, notes: draft.notes, waterL: toSI(waterVolume, displayUnits(unitSystem.value).volume) };
  }

  /** Logs a brew; the used inputs' stock changes on the server, so the farm's inputs are fetched again. */
  async function create(draft: BrewDraft): Promise<Brew> {
    const brew = put(await brewsApi.createBrew(toCreateInput(draft)));
    if (inputsByFarm.value.has(brew.farmId)) {
      const inputs = await inventoryApi.fetchInputs({ farmId: brew.farmId }).catch(() => null);
      if (inputs) inputsByFarm.value = new Map(inputsByFarm.value).set(brew.farmId, inputs.filter((i) => i.archivedAt === null));
    }
    return brew;
  }

  async function setStatus(brewId: number, next: BrewStatus): Promise<Brew> {
    return put(await brewsApi.updateBrew(brewId, { status: next }));
  }

  /** Logs a temperature typed in the user's unit (°C or °F); the API takes °C. */
  async function logTemperature(brewId: number, value: number): Promise<Brew> {
    const temperatureC = toSI(value, displayUnits(unitSystem.value).temperature);
    return put(await brewsApi.logBrewTemperature(brewId, { temperatureC }));
  }

  function reset(): void {
    brews.value = [];
    status.value = 'idle';
    error.value = null;
    filter.value = { farmId: null, status: null };
    tanksByFarm.value = new Map();
    inputsByFarm.value = new Map();
    tiles.value = new Map();
    optionsStatus.value = 'idle';
    optionsError.value = null;
  }

  return {
    brews,
    status,
    error,
    filter,
    optionsStatus,
    optionsError,
    unitSystem,
    load,
    setFilter,
    loadFarmOptions,
    tanksOf,
    inputsOf,
    tankFill,
    batchFitOf,
    mixFitOf,
    shortfallsOf,
    toCreateInput,
    create,
    setStatus,
    logTemperature,
    reset,
  };
});
