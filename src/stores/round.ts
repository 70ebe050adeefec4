import { computed, ref, shallowRef, watch } from 'vue';
import { defineStore } from 'pinia';
import type { Tank, TankTile } from '@shared/schemas';
import { COLD_CULTURE_C } from '@shared/flags';
import { decimalMarkOf, type DecimalMark, type UnitSystem } from '@shared/units';
import { fetchBoard } from '@/api/board';
import { errorMessage } from '@/api/http';
import { currentLocale, i18n } from '@/i18n';
import { isUnreachable as unreachable } from '@/offline/unreachable';
import { fetchTanks } from '@/api/tanks';
import type { OutboxRound } from '@/offline/db';
import { useFarmsStore, type LoadStatus } from './farms';
import { applyAnswered } from './round-answers';
import { blankEntry, LOCKED, newEntryKey, roundRow, type RoundDraft, type RoundEntryDraft, type RoundRow } from './round-entry';
import { useRoundOutboxStore } from './round-outbox';
import { emptySaved, keepCopies, readSaved, writeSaved, type SavedRounds } from './round-saved';
import { roundProgress, summarizeRound, waitingMessage, type RoundProgress, type RoundSummary, type SubmitProblem } from './round-summary';
import { useSessionStore } from './session';

export { CULTURE_INACTIVE_BELOW_C, exampleNumber, newEntryKey, setupOf } from './round-entry';
export type { EntryOutcome, EntryResult, ReadingPreview, RoundDraft, RoundEntryDraft, RoundRow, RowContext, TemperaturePreview } from './round-entry';
export type { RoundProgress, RoundSummary, SubmitProblem } from './round-summary';
export { waitingMessage } from './round-summary';

/**
 * The reading round of one farm: the tanks in walking order, what was typed for each (kept on the
 * device in IndexedDB until it is stored), the litres it gives, and sending it through the outbox with
 * retry-safe idempotency keys.
 */
export const useRoundStore = defineStore('round', () => {
  const session = useSessionStore();
  const farmsStore = useFarmsStore();
  const outbox = useRoundOutboxStore();

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

  let saved: SavedRounds = emptySaved(0);
  // `saved` is a plain object (it is what goes to IndexedDB); this counter tells computeds it changed.
  const savedVersion = ref(0);
  let savedForUser: number | null = null;
  let savedLoading: Promise<void> | null = null;
  let writes: Promise<void> = Promise.resolve();
  let loadToken = 0;

  const unitSystem = computed<UnitSystem>(() => session.user?.unitSystem ?? 'metric');
  /** The decimal mark of the person's language (the browser's before they sign in), set again when it changes. */
  const decimalMark = ref<DecimalMark>(decimalMarkOf(currentLocale()));
  watch(currentLocale, (locale) => (decimalMark.value = decimalMarkOf(locale)));
  /** The farm's own cold-culture limit (°C), from the farm list or the device's copy, else the shared default. */
  const coldCultureC = computed<number>(() => {
    const id = farmId.value;
    if (id === null) return COLD_CULTURE_C;
    void savedVersion.value;
    return farmsStore.activeFarms.find((f) => f.id === id)?.coldCultureC ?? saved.copies[String(id)]?.coldCultureC ?? COLD_CULTURE_C;
  });
  /** Reads this user's saved rounds once per user (another person on the device never sees them). */
  function ensureSaved(): Promise<void> {
    const id = session.user?.id ?? null;
    if (id === savedForUser) return savedLoading ?? Promise.resolve();
    savedForUser = id;
    saved = emptySaved(id ?? 0);
    savedVersion.value++;
    farmId.value = null;
    tanks.value = [];
    tiles.value = new Map();
    draft.value = null;
    status.value = 'idle';
    submitProblem.value = null;
    if (id === null) return (savedLoading = Promise.resolve());
    savedLoading = readSaved(id).then(
      (found) => {
        if (savedForUser !== id) return;
        saved = found;
        savedVersion.value++;
      },
      (e: unknown) => {
        storageProblem.value = i18n.global.t('round.problems.keptRoundsUnreadable', { reason: errorMessage(e) });
      },
    );
    return savedLoading;
  }

  /** Writes the user's rounds to IndexedDB, one write after another so an older state never lands last. */
  function persist(): Promise<void> {
    if (savedForUser === null) return writes;
    if (draft.value) saved.drafts[String(draft.value.farmId)] = draft.value;
    savedVersion.value++;
    const snapshot = JSON.parse(JSON.stringify(saved)) as SavedRounds;
    writes = writes.then(
      () =>
        writeSaved(snapshot).then(
          () => {
            storageProblem.value = null;
          },
          (e: unknown) => {
            storageProblem.value = i18n.global.t('round.problems.notKept', { reason: errorMessage(e) });
          },
        ),
    );
    return writes;
  }

  /** Writes answered outbox rounds into their farms' drafts (the cards show each entry's result). */
  async function takeAnswers(answered: OutboxRound[]): Promise<void> {
    await ensureSaved();
    let changed = false;
    for (const r of answered) {
      if (r.userId !== savedForUser) continue;
      const target = draft.value && draft.value.farmId === r.farmId ? draft.value : saved.drafts[String(r.farmId)];
      if (target && applyAnswered(target, r)) changed = true;
    }
    if (!changed) return;
    if (!waitingRows.value.length && submitProblem.value?.kind === 'network') submitProblem.value = null;
    await persist();
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
    const context = { decimalMark: decimalMark.value, coldCultureC: coldCultureC.value, unitSystem: unitSystem.value };
    return tanks.value.map((tank) => roundRow(tank, d?.entries[String(tank.id)] ?? blankEntry(tank.id, unitSystem.value), tiles.value.get(tank.id), context));
  });

  const summary = computed<RoundSummary>(() => summarizeRound(rows.value));
  const progress = computed<RoundProgress>(() => roundProgress(rows.value));

  const hasResults = computed(() => rows.value.some((r) => r.entry.result !== null));
  const toSend = computed(() => rows.value.filter((r) => r.payload !== null));
  const withProblems = computed(() => rows.value.filter((r) => !r.locked && r.problem !== null));
  const awaitingAnswers = computed(() => rows.value.filter((r) => r.awaitingAnswer));
  /** Entries of this farm waiting in the outbox. */
  const waitingRows = computed(() => rows.value.filter((r) => r.waiting));

  function draftFor(id: number): RoundDraft {
    const found = saved.drafts[String(id)];
    // A JSON copy: the saved draft may be the reactive one shown before, which structuredClone refuses.
    return found ? (JSON.parse(JSON.stringify(found)) as RoundDraft) : { farmId: id, takenAt: null, entries: {} };
  }

  /** Loads farms, picks the remembered one (or the first), and loads its tanks. */
  async function start(): Promise<void> {
    await ensureSaved();
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
    await ensureSaved();
    if (farmId.value !== id || !draft.value) {
      farmId.value = id;
      draft.value = draftFor(id);
      submitProblem.value = null;
    }
    saved.lastFarmId = id;
    void persist();
    await loadTanks();
    await writes;
  }

  async function loadTanks(): Promise<void> {
    const id = farmId.value;
    if (id === null) return;
    const token = ++loadToken;
    status.value = 'loading';
    error.value = null;
    lastReadingsError.value = null;
    // Every farm's tanks in one request, so the device keeps a copy of each farm for a round without signal.
    const [tankResult, boardResult] = await Promise.allSettled([fetchTanks(), fetchBoard()]);
    if (token !== loadToken) return;
    const copy = saved.copies[String(id)];

    let boardTiles: Map<number, TankTile[]> | null = null;
    if (boardResult.status === 'fulfilled') {
      boardTiles = new Map(boardResult.value.farms.map((f) => [f.farmId, f.tanks]));
      tiles.value = new Map((boardTiles.get(id) ?? []).map((t) => [t.tankId, t]));
    } else {
      // Without signal the last readings are the ones kept with the tanks.
      const kept = unreachable(boardResult.reason) ? copy?.tiles : undefined;
      tiles.value = new Map((kept ?? []).map((t) => [t.tankId, t]));
      if (!kept) lastReadingsError.value = errorMessage(boardResult.reason);
    }

    if (tankResult.status === 'fulfilled') {
      const live = tankResult.value.filter((t) => t.archivedAt === null);
      tanks.value = live.filter((t) => t.farmId === id);
      copySavedAt.value = null;
      keepCopies(saved, live, boardTiles, farmOptions.value.map((f) => f.id), farmsStore.activeFarms);
      void persist();
      status.value = 'ready';
      return;
    }
    if (copy && unreachable(tankResult.reason)) {
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
    if (entry.outboxSeq !== undefined && entry.outboxSeq !== null) return null;
    return entry.result && LOCKED.has(entry.result.status) ? null : entry;
  }

  function edited(entry: RoundEntryDraft): void {
    entry.editedAt = new Date().toISOString();
    // The server's refusal (or clash) was about what was there before.
    if (entry.result?.status === 'refused' || entry.result?.status === 'conflict') entry.result = null;
    submitProblem.value = null;
    void persist();
  }

  function setReading(tankId: number, text: string): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    // An answer was about the reading as it stood; a changed one is asked about afresh.
    if (text !== entry.reading) entry.confirmed = false;
    entry.reading = text;
    if (text.trim() && !entry.idempotencyKey) entry.idempotencyKey = newEntryKey();
    edited(entry);
  }

  function setTemperature(tankId: number, text: string): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    if (text !== entry.temperature) entry.confirmed = false;
    entry.temperature = text;
    edited(entry);
  }

  /** The person's answer to the questions a tank's entry raises: true for "Yes, this is right". */
  function confirmEntry(tankId: number, yes: boolean): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    entry.confirmed = yes;
    edited(entry);
  }

  function openTemperature(tankId: number, open: boolean): void {
    const entry = entryFor(tankId);
    if (!entry) return;
    entry.temperatureOpen = open;
    if (!open && entry.temperature !== '') {
      entry.temperature = '';
      entry.confirmed = false;
    }
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

  /** Sends every typed entry not stored yet through the outbox; a resend keeps the keys and time, so nothing is stored twice. */
  async function submit(): Promise<void> {
    const d = draft.value;
    if (submitting.value || !d) return;
    submitProblem.value = null;
    if (withProblems.value.length) {
      const codes = withProblems.value.map((r) => r.tank.code).join(', ');
      submitProblem.value = { kind: 'invalid', message: i18n.global.t('round.problems.fixFirst', { codes }) };
      return;
    }
    if (awaitingAnswers.value.length) {
      const codes = awaitingAnswers.value.map((r) => r.tank.code).join(', ');
      submitProblem.value = { kind: 'invalid', message: i18n.global.t('round.problems.answerFirst', { codes }) };
      return;
    }
    const sending = toSend.value;
    if (!sending.length && !waitingRows.value.length) {
      submitProblem.value = { kind: 'invalid', message: i18n.global.t('round.problems.typeFirst') };
      return;
    }
    submitting.value = true;
    try {
      if (sending.length) {
        d.takenAt ??= takenAtFor(sending);
        const farmName = farmOptions.value.find((f) => f.id === d.farmId)?.name ?? '';
        const seq = await outbox.add({ farmId: d.farmId, farmName, takenAt: d.takenAt, entries: sending.map((r) => r.payload!) });
        for (const r of sending) d.entries[String(r.tank.id)].outboxSeq = seq;
        await persist();
      }
      await outbox.flush(true);
      const stuck = outbox.waiting.find((r) => r.farmId === d.farmId);
      if (waitingRows.value.length && stuck) {
        const away = stuck.lastErrorStatus === 0 || stuck.lastErrorStatus === null;
        submitProblem.value = away
          ? { kind: 'network', message: waitingMessage() }
          : { kind: 'server', message: i18n.global.t('round.problems.server', { reason: stuck.lastError ?? i18n.global.t('round.problems.noAnswer') }) };
      }
    } catch (e) {
      storageProblem.value = i18n.global.t('round.problems.notQueued', { reason: errorMessage(e) });
    } finally {
      submitting.value = false;
    }
  }

  /** Forgets this farm's round (after it is stored) so the next one starts blank with new keys. */
  function newRound(): void {
    if (farmId.value === null) return;
    delete saved.drafts[String(farmId.value)];
    draft.value = { farmId: farmId.value, takenAt: null, entries: {} };
    submitProblem.value = null;
    void persist();
  }

  // A sign-out or a different person on the same device drops what was shown.
  watch(
    () => session.user?.id ?? null,
    () => void ensureSaved(),
  );
  outbox.onAnswered(takeAnswers);

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
    decimalMark,
    coldCultureC,
    farmOptions,
    rows,
    summary,
    progress,
    hasResults,
    toSend,
    withProblems,
    awaitingAnswers,
    waitingRows,
    start,
    selectFarm,
    loadTanks,
    setReading,
    setTemperature,
    openTemperature,
    setNote,
    confirmEntry,
    submit,
    newRound,
  };
});
