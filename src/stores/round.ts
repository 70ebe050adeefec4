import { computed, ref, shallowRef, watch } from 'vue';
import { defineStore } from 'pinia';
import { readingToVolumes, type TankSetup } from '@shared/readings';
import { firstIssue, roundEntrySchema, type RoundEntry, type RoundEntryResult, type Tank, type TankTile } from '@shared/schemas';
import { convert, displayUnits, type UnitSystem } from '@shared/units';
import { fetchBoard } from '@/api/board';
import { errorMessage, isApiError } from '@/api/http';
import { submitRound } from '@/api/readings';
import { fetchTanks } from '@/api/tanks';
import { useFarmsStore, type LoadStatus } from './farms';
import { useSessionStore } from './session';

/** What the server did with one entry of a submitted round. */
export type EntryOutcome = RoundEntryResult['status'];

/** The server's answer for one entry, kept with the entry (and on the device) until a new round starts. */
export interface EntryResult {
  status: EntryOutcome;
  reason?: string;
  takenAt?: string;
  grossL?: number;
  usableL?: number;
}

/** One tank's line of a round as typed, in the units it was typed in. */
export interface RoundEntryDraft {
  tankId: number;
  reading: string;
  readingUnit: 'mm' | 'in';
  temperature: string;
  temperatureUnit: 'C' | 'F';
  /** The person asked for the temperature field (culture tanks show it without asking). */
  temperatureOpen: boolean;
  note: string;
  /** Made when a reading is first typed and kept for every retry, so the server stores it once. */
  idempotencyKey: string | null;
  editedAt: string | null;
  result: EntryResult | null;
}

/** A farm's round in progress. */
export interface RoundDraft {
  farmId: number;
  /** Fixed at the first send and reused by every retry, so a retried entry is the same reading. */
  takenAt: string | null;
  entries: Record<string, RoundEntryDraft>;
}

/** The tank-list copy kept on the device so a round can go on without signal. */
interface TanksCopy {
  savedAt: string;
  farmName: string;
  tanks: Tank[];
}

interface Saved {
  v: 1;
  lastFarmId: number | null;
  drafts: Record<string, RoundDraft>;
  copies: Record<string, TanksCopy>;
}

/** The live reading under the input: nothing typed, refused with the shared function's reason, or its volumes. */
export type ReadingPreview =
  | { state: 'empty' }
  | { state: 'invalid'; reason: string }
  | { state: 'ok'; readingMm: number; levelMm: number; grossL: number; usableL: number; percentFull: number };

/** The optional temperature: nothing typed, refused with a reason, or in °C. */
export type TemperaturePreview = { state: 'empty' } | { state: 'invalid'; reason: string } | { state: 'ok'; temperatureC: number };

/** Everything a tank's card shows. */
export interface RoundRow {
  tank: Tank;
  entry: RoundEntryDraft;
  reading: ReadingPreview;
  temperature: TemperaturePreview;
  showTemperature: boolean;
  /** The tank's latest stored reading: this round's when stored, else the board's. */
  last: { takenAt: string; grossL: number | null; usableL: number | null } | null;
  /** Stored (or stored by an earlier try): the entry can no longer change. */
  locked: boolean;
  /** The entry as it would be sent now; null when there is nothing to send or it is refused here. */
  payload: RoundEntry | null;
  /** Why the entry cannot be sent as it stands (reading or temperature), or null. */
  problem: string | null;
  /** Worth telling the person on the spot, though the entry can be sent (a cold culture). */
  warning: string | null;
}

export interface SubmitProblem {
  kind: 'network' | 'server' | 'invalid';
  message: string;
}

export interface RoundSummary {
  stored: number;
  duplicate: number;
  refused: number;
  /** Not stored: another reading of the tank holds the same moment (sent again, it is stored at a new time). */
  conflict: number;
  /** The names of those tanks. */
  conflictNames: string[];
  /** Typed entries not yet stored (to send, or to fix). */
  waiting: number;
  /** Some entries were sent and every typed entry is now stored. */
  complete: boolean;
  /** "7 stored, 1 refused". */
  text: string;
}

const STORAGE_PREFIX = 'brimstock.round.v1.user-';
/** Below this a culture goes inactive (common practice, no published source; see PRODUCT.md). */
export const CULTURE_INACTIVE_BELOW_C = 18;
/** The schema's own rule for temperature, so the phone refuses what the server would. */
const temperatureSchema = roundEntrySchema.shape.temperatureC;

/** A fresh idempotency key: 32 hex digits (a v4 UUID without dashes). */
export function newEntryKey(): string {
  const c = globalThis.crypto;
  if (typeof c?.randomUUID === 'function') return c.randomUUID().replace(/-/g, '');
  // randomUUID exists only in secure contexts; a farm LAN address over plain http still has getRandomValues.
  const bytes = c.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Parsed decimal text; null when empty. Accepts a comma as the decimal mark (phone keyboards in many locales). */
export function parseDecimal(text: string, field: string, example: string): { ok: true; value: number } | { ok: false; reason: string } | null {
  const t = text.trim();
  if (!t) return null;
  if (!/^[+-]?(\d+([.,]\d*)?|[.,]\d+)$/.test(t)) return { ok: false, reason: `${field}: type a number, e.g. ${example}` };
  // "1,250" may mean 1250 or 1.25: refuse rather than guess a reading a thousand times off.
  if (/^[+-]?\d+,\d{3}$/.test(t)) return { ok: false, reason: `${field}: "${t}" is unclear; type ${t.replace(',', '')} or ${t.replace(',', '.')} without a thousands separator` };
  return { ok: true, value: Number(t.replace(',', '.')) };
}

/** The parts of a tank the shared reading function needs. */
export function setupOf(tank: Tank): TankSetup {
  return {
    geometry: tank.geometry,
    datumOffsetMm: tank.datumOffsetMm,
    outletHeightMm: tank.outletHeightMm,
    safeFillLevelMm: tank.safeFillLevelMm,
    specificGravity: tank.specificGravity,
  };
}

function readingPreview(tank: Tank, entry: RoundEntryDraft): ReadingPreview {
  const parsed = parseDecimal(entry.reading, 'Sight-tube reading', entry.readingUnit === 'in' ? '48.5' : '1250');
  if (parsed === null) return { state: 'empty' };
  if (!parsed.ok) return { state: 'invalid', reason: parsed.reason };
  const readingMm = convert(parsed.value, entry.readingUnit, 'mm');
  const v = readingToVolumes(setupOf(tank), { kind: 'sight-tube', readingMm });
  if (!v.ok) return { state: 'invalid', reason: v.reason };
  return { state: 'ok', readingMm, levelMm: v.levelMm, grossL: v.grossL, usableL: v.usableL, percentFull: v.percentFull };
}

function temperaturePreview(entry: RoundEntryDraft): TemperaturePreview {
  const parsed = parseDecimal(entry.temperature, 'Temperature', entry.temperatureUnit === 'F' ? '68' : '21.5');
  if (parsed === null) return { state: 'empty' };
  if (!parsed.ok) return { state: 'invalid', reason: parsed.reason };
  const temperatureC = convert(parsed.value, entry.temperatureUnit, 'C');
  const checked = temperatureSchema.safeParse(temperatureC);
  if (!checked.success) return { state: 'invalid', reason: `Temperature ${checked.error.issues[0]?.message ?? 'is out of range'}` };
  return { state: 'ok', temperatureC };
}

function blankEntry(tankId: number, system: UnitSystem): RoundEntryDraft {
  const units = displayUnits(system);
  return {
    tankId,
    reading: '',
    readingUnit: units.length,
    temperature: '',
    temperatureUnit: units.temperature,
    temperatureOpen: false,
    note: '',
    idempotencyKey: null,
    editedAt: null,
    result: null,
  };
}

function emptySaved(): Saved {
  return { v: 1, lastFarmId: null, drafts: {}, copies: {} };
}

function readSaved(key: string): Saved {
  try {
    const raw = localStorage.getItem(key);
    if (!raw) return emptySaved();
    const parsed = JSON.parse(raw) as Partial<Saved>;
    if (parsed.v !== 1) return emptySaved();
    return { v: 1, lastFarmId: parsed.lastFarmId ?? null, drafts: parsed.drafts ?? {}, copies: parsed.copies ?? {} };
  } catch {
    return emptySaved();
  }
}

const LOCKED: ReadonlySet<EntryOutcome> = new Set(['stored', 'duplicate']);

/**
 * The reading round of one farm: the tanks in walking order, what was typed for each (kept on the
 * device until it is stored), the litres it gives, and sending it with retry-safe idempotency keys.
 */
export const useRoundStore = defineStore('round', () => {
  const session = useSessionStore();
  const farmsStore = useFarmsStore();

  const farmId = ref<number | null>(null);
  const tanks = shallowRef<Tank[]>([]);
  const tiles = shallowRef<Map<number, TankTile>>(new Map());
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);
  /** When the tank list shown is the device's copy (no signal), the time it was saved. */
  const copySavedAt = ref<string | null>(null);
  /** Why the last readings could not be loaded (the round still works), or null. */
  const lastReadingsError = ref<string | null>(null);
  const draft = ref<RoundDraft | null>(null);
  const submitting = ref(false);
  const submitProblem = ref<SubmitProblem | null>(null);
  /** Set when the device refused to keep the round (storage full or blocked). */
  const storageProblem = ref<string | null>(null);

  let saved: Saved = emptySaved();
  // `saved` is a plain object (it is what goes to localStorage); this counter tells computeds it changed.
  const savedVersion = ref(0);
  let savedForUser: number | null = null;
  let loadToken = 0;

  const unitSystem = computed<UnitSystem>(() => session.user?.unitSystem ?? 'metric');
  const storageKey = computed(() => (session.user ? `${STORAGE_PREFIX}${session.user.id}` : null));

  /** Reads this user's saved rounds once per user (another person on the device never sees them). */
  function ensureSaved(): void {
    const id = session.user?.id ?? null;
    if (id === savedForUser) return;
    savedForUser = id;
    saved = storageKey.value ? readSaved(storageKey.value) : emptySaved();
    savedVersion.value++;
    farmId.value = null;
    tanks.value = [];
    tiles.value = new Map();
    draft.value = null;
    status.value = 'idle';
    submitProblem.value = null;
  }

  function persist(): void {
    if (!storageKey.value) return;
    if (draft.value) saved.drafts[String(draft.value.farmId)] = draft.value;
    savedVersion.value++;
    try {
      localStorage.setItem(storageKey.value, JSON.stringify(saved));
      storageProblem.value = null;
    } catch (e) {
      storageProblem.value = `This device would not keep the round (${errorMessage(e)}). Send it before closing the page.`;
    }
  }

  /** Farms offered: the user's active farms, or (without signal) the farms whose tanks are on the device. */
  const farmOptions = computed<{ id: number; name: string }[]>(() => {
    if (farmsStore.status === 'ready') return farmsStore.activeFarms.map((f) => ({ id: f.id, name: f.name }));
    void savedVersion.value;
    return Object.entries(saved.copies)
      .map(([id, copy]) => ({ id: Number(id), name: copy.farmName }))
      .sort((a, b) => a.name.localeCompare(b.name));
  });

  const rows = computed<RoundRow[]>(() => {
    const d = draft.value;
    return tanks.value.map((tank) => {
      const entry = d?.entries[String(tank.id)] ?? blankEntry(tank.id, unitSystem.value);
      const reading = readingPreview(tank, entry);
      const temperature = temperaturePreview(entry);
      const locked = entry.result !== null && LOCKED.has(entry.result.status);
      const tile = tiles.value.get(tank.id);
      const fromRound = entry.result?.takenAt ? { takenAt: entry.result.takenAt, grossL: entry.result.grossL ?? null, usableL: entry.result.usableL ?? null } : null;
      const fromBoard = tile?.takenAt ? { takenAt: tile.takenAt, grossL: tile.grossL, usableL: tile.usableL } : null;
      const last = fromRound && (!fromBoard || fromRound.takenAt >= fromBoard.takenAt) ? fromRound : fromBoard;

      let problem: string | null = null;
      let payload: RoundEntry | null = null;
      if (reading.state === 'invalid') problem = reading.reason;
      else if (temperature.state === 'invalid') problem = temperature.reason;
      else if (reading.state === 'ok' && entry.idempotencyKey && (!entry.result || entry.result.status === 'conflict')) {
        const checked = roundEntrySchema.safeParse({
          tankId: tank.id,
          readingMm: reading.readingMm,
          temperatureC: temperature.state === 'ok' ? temperature.temperatureC : undefined,
          note: entry.note,
          idempotencyKey: entry.idempotencyKey,
        });
        if (checked.success) payload = checked.data;
        else problem = firstIssue(checked.error).message;
      }
      const cold = tank.contents === 'culture' && temperature.state === 'ok' && temperature.temperatureC < CULTURE_INACTIVE_BELOW_C;
      return {
        tank,
        entry,
        reading,
        temperature,
        warning: cold ? `Below about ${CULTURE_INACTIVE_BELOW_C} °C a culture goes inactive: check its heater.` : null,
        // A stored entry keeps the field only when it holds a value; an empty locked field says nothing.
        showTemperature: entry.temperature.trim() !== '' || (!locked && (tank.contents === 'culture' || entry.temperatureOpen)),
        last,
        locked,
        payload,
        problem,
      };
    });
  });

  const summary = computed<RoundSummary>(() => {
    let stored = 0;
    let duplicate = 0;
    let refused = 0;
    const conflictNames: string[] = [];
    let waiting = 0;
    for (const row of rows.value) {
      const outcome = row.entry.result?.status;
      if (outcome === 'stored') stored++;
      else if (outcome === 'duplicate') duplicate++;
      else if (outcome === 'refused') refused++;
      else if (outcome === 'conflict') conflictNames.push(row.tank.name);
      if (!row.locked && row.reading.state !== 'empty') waiting++;
    }
    const parts: string[] = [];
    const conflict = conflictNames.length;
    if (stored || (!duplicate && !refused && !conflict)) parts.push(`${stored} stored`);
    if (duplicate) parts.push(`${duplicate} already stored`);
    if (refused) parts.push(`${refused} refused`);
    if (conflict) parts.push(`${conflict} not stored`);
    return { stored, duplicate, refused, conflict, conflictNames, waiting, complete: stored + duplicate > 0 && waiting === 0, text: parts.join(', ') };
  });

  const hasResults = computed(() => rows.value.some((r) => r.entry.result !== null));
  const toSend = computed(() => rows.value.filter((r) => r.payload !== null));
  const withProblems = computed(() => rows.value.filter((r) => !r.locked && r.problem !== null));

  function draftFor(id: number): RoundDraft {
    const found = saved.drafts[String(id)];
    // A JSON copy: the saved draft may be the reactive one shown before, which structuredClone refuses.
    return found ? (JSON.parse(JSON.stringify(found)) as RoundDraft) : { farmId: id, takenAt: null, entries: {} };
  }

  /** Loads farms, picks the remembered one (or the first), and loads its tanks. */
  async function start(): Promise<void> {
    ensureSaved();
    await farmsStore.ensureLoaded();
    const options = farmOptions.value;
    const wanted = farmId.value ?? saved.lastFarmId;
    const pick = options.find((f) => f.id === wanted) ?? options[0];
    if (!pick) {
      farmId.value = null;
      tanks.value = [];
      status.value = farmsStore.status === 'error' ? 'error' : 'ready';
      error.value = farmsStore.status === 'error' ? farmsStore.error : null;
      return;
    }
    await selectFarm(pick.id);
  }

  /** Switches to a farm's round (its typed entries come back) and remembers the choice. */
  async function selectFarm(id: number): Promise<void> {
    ensureSaved();
    if (farmId.value !== id || !draft.value) {
      farmId.value = id;
      draft.value = draftFor(id);
      submitProblem.value = null;
    }
    saved.lastFarmId = id;
    persist();
    await loadTanks();
  }

  async function loadTanks(): Promise<void> {
    const id = farmId.value;
    if (id === null) return;
    const token = ++loadToken;
    status.value = 'loading';
    error.value = null;
    lastReadingsError.value = null;
    const [tankResult, boardResult] = await Promise.allSettled([fetchTanks({ farmId: id }), fetchBoard()]);
    if (token !== loadToken) return;

    if (boardResult.status === 'fulfilled') {
      const farm = boardResult.value.farms.find((f) => f.farmId === id);
      tiles.value = new Map((farm?.tanks ?? []).map((t) => [t.tankId, t]));
    } else {
      tiles.value = new Map();
      lastReadingsError.value = errorMessage(boardResult.reason);
    }

    if (tankResult.status === 'fulfilled') {
      tanks.value = tankResult.value.filter((t) => t.archivedAt === null);
      copySavedAt.value = null;
      const name = farmOptions.value.find((f) => f.id === id)?.name ?? saved.copies[String(id)]?.farmName ?? '';
      saved.copies[String(id)] = { savedAt: new Date().toISOString(), farmName: name, tanks: tanks.value };
      persist();
      status.value = 'ready';
      return;
    }
    const copy = saved.copies[String(id)];
    if (copy && isApiError(tankResult.reason, { status: 0 })) {
      tanks.value = copy.tanks;
      copySavedAt.value = copy.savedAt;
      status.value = 'ready';
      return;
    }
    tanks.value = [];
    error.value = errorMessage(tankResult.reason);
    status.value = 'error';
  }

  function entryFor(tankId: number): RoundEntryDraft | null {
    const d = draft.value;
    if (!d) return null;
    const key = String(tankId);
    d.entries[key] ??= blankEntry(tankId, unitSystem.value);
    const entry = d.entries[key];
    return entry.result && LOCKED.has(entry.result.status) ? null : entry;
  }

  function edited(entry: RoundEntryDraft): void {
    entry.editedAt = new Date().toISOString();
    // The server's refusal (or clash) was about what was there before.
    if (entry.result?.status === 'refused' || entry.result?.status === 'conflict') entry.result = null;
    submitProblem.value = null;
    persist();
  }

  function setReading(tankId: number, text: string): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    entry.reading = text;
    if (text.trim() && !entry.idempotencyKey) entry.idempotencyKey = newEntryKey();
    edited(entry);
  }

  function setTemperature(tankId: number, text: string): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    entry.temperature = text;
    edited(entry);
  }

  function openTemperature(tankId: number, open: boolean): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    entry.temperatureOpen = open;
    if (!open) entry.temperature = '';
    edited(entry);
  }

  function setNote(tankId: number, text: string): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    entry.note = text;
    edited(entry);
  }

  /** When the round was walked: the last edit of what is sent (never later than now). */
  function takenAtFor(sending: RoundRow[]): string {
    const now = new Date().toISOString();
    const last = sending.reduce<string | null>((latest, r) => (r.entry.editedAt && (!latest || r.entry.editedAt > latest) ? r.entry.editedAt : latest), null);
    return last && last < now ? last : now;
  }

  /** Sends every typed entry not stored yet; a retry sends the same keys and time, so nothing is stored twice. */
  async function submit(): Promise<void> {
    const d = draft.value;
    if (submitting.value || !d) return;
    submitProblem.value = null;
    if (withProblems.value.length) {
      const codes = withProblems.value.map((r) => r.tank.code).join(', ');
      submitProblem.value = { kind: 'invalid', message: `Fix or clear ${codes} before sending.` };
      return;
    }
    const sending = toSend.value;
    if (!sending.length) {
      submitProblem.value = { kind: 'invalid', message: 'Type at least one sight-tube reading first.' };
      return;
    }
    d.takenAt ??= takenAtFor(sending);
    persist();
    submitting.value = true;
    try {
      const { results } = await submitRound({ farmId: d.farmId, takenAt: d.takenAt, entries: sending.map((r) => r.payload!) });
      for (const result of results) {
        const entry = d.entries[String(result.tankId)];
        if (!entry) continue;
        entry.result = {
          status: result.status,
          reason: result.reason,
          takenAt: result.reading?.takenAt,
          grossL: result.reading?.grossL,
          usableL: result.reading?.usableL,
        };
        // Another reading holds this moment: a new round time (every entry sent has its answer now)
        // and this entry's answer as its last change, so sending it again stores it at a new time.
        if (result.status === 'conflict') {
          d.takenAt = null;
          entry.editedAt = new Date().toISOString();
        }
      }
    } catch (e) {
      submitProblem.value = isApiError(e, { status: 0 })
        ? { kind: 'network', message: 'No connection. Your readings are kept on this device; try again when you have signal.' }
        : { kind: 'server', message: errorMessage(e) };
    } finally {
      submitting.value = false;
      persist();
    }
  }

  /** Forgets this farm's round (after it is stored) so the next one starts blank with new keys. */
  function newRound(): void {
    if (farmId.value === null) return;
    delete saved.drafts[String(farmId.value)];
    draft.value = { farmId: farmId.value, takenAt: null, entries: {} };
    submitProblem.value = null;
    persist();
  }

  // A sign-out or a different person on the same device drops what was shown.
  watch(
    () => session.user?.id ?? null,
    () => ensureSaved(),
  );

  return {
    farmId,
    tanks,
    status,
    error,
    copySavedAt,
    lastReadingsError,
    draft,
    submitting,
    submitProblem,
    storageProblem,
    unitSystem,
    farmOptions,
    rows,
    summary,
    hasResults,
    toSend,
    withProblems,
    start,
    selectFarm,
    loadTanks,
    setReading,
    setTemperature,
    openTemperature,
    setNote,
    submit,
    newRound,
  };
});
