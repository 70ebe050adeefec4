import { computed, reactive, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import { FLAG_KINDS, type Flag, type FlagKind } from '@shared/schemas';
import * as flagsApi from '@/api/flags';
import type { FlagStatusFilter, FlagsFarmPush } from '@/api/flags';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';

export interface FlagFilters {
  status: FlagStatusFilter;
  farmId: number | null;
  kind: FlagKind | null;
}

const ACTIVE_STATUSES: readonly string[] = ['open', 'acknowledged'];

function newestFirst(a: Flag, b: Flag): number {
  return b.raisedAt.localeCompare(a.raisedAt) || b.id - a.id;
}

/** True when `flag` belongs in a list shown with `filters`. */
export function flagMatches(flag: Flag, filters: FlagFilters): boolean {
  if (filters.farmId !== null && flag.farmId !== filters.farmId) return false;
  if (filters.kind !== null && flag.kind !== filters.kind) return false;
  if (filters.status === 'all') return true;
  if (filters.status === 'active') return ACTIVE_STATUSES.includes(flag.status);
  return flag.status === filters.status;
}

/**
 * Flags: the filtered list of the Flags screen, and every active flag of the user's farms for the
 * stock board. Both follow the server's 'flags:farm' pushes, each of which carries one farm's whole
 * set of active flags and so replaces what was held for that farm.
 */
export const useFlagsStore = defineStore('flags', () => {
  const filters = reactive<FlagFilters>({ status: 'active', farmId: null, kind: null });
  const list = shallowRef<Flag[]>([]);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);

  const active = shallowRef<Flag[]>([]);
  const activeStatus = ref<LoadStatus>('idle');
  const activeError = ref<string | null>(null);

  // A load started earlier than a newer load is dropped; one that returns after pushes or
  // acknowledgements that arrived while it was on its way gets them replayed over its rows.
  let listRevision = 0;
  type Change = { push: FlagsFarmPush } | { flag: Flag };
  let changes: Change[] = [];
  let loadsInFlight = 0;
  const record = (change: Change) => {
    if (loadsInFlight > 0) changes.push(change);
  };
  const changesSince = (mark: number) => changes.slice(mark);
  const startLoad = () => {
    if (loadsInFlight++ === 0) changes = [];
    return changes.length;
  };
  const endLoad = () => {
    loadsInFlight--;
  };

  function mergePush(rows: Flag[], push: FlagsFarmPush, keep: (f: Flag) => boolean): Flag[] {
    return [...rows.filter((f) => f.farmId !== push.farmId), ...push.flags.filter(keep)].sort(newestFirst);
  }
  function mergeFlag(rows: Flag[], flag: Flag): Flag[] {
    return rows.map((f) => (f.id === flag.id ? flag : f));
  }
  /** True when a push tells the whole story for the list's filters (every open or seen flag of a farm is in it). */
  const pushCoversList = () => filters.status === 'active' || filters.status === 'open' || filters.status === 'acknowledged';
  function replay(rows: Flag[], mark: number, forList: boolean): Flag[] {
    let out = rows;
    for (const c of changesSince(mark)) {
      if ('flag' in c) {
        // A flag cleared by hand meanwhile leaves the active flags, and any list it no longer matches.
        const gone = forList ? !flagMatches(c.flag, filters) : !ACTIVE_STATUSES.includes(c.flag.status);
        out = gone ? out.filter((f) => f.id !== c.flag.id) : mergeFlag(out, c.flag);
      }
      else if (!forList) out = mergePush(out, c.push, () => true);
      else if (pushCoversList()) out = mergePush(out, c.push, (f) => flagMatches(f, filters));
    }
    return out;
  }

  /** Active flags per kind, in the order of FLAG_KINDS, kinds with none left out. */
  const activeByKind = computed(() =>
    FLAG_KINDS.map((kind) => ({ kind, flags: active.value.filter((f) => f.kind === kind) })).filter((k) => k.flags.length > 0),
  );
  const openCount = computed(() => active.value.filter((f) => f.status === 'open').length);

  /** Loads the list for the current filters; `quiet` keeps the rows on screen while it loads. */
  async function load(options: { quiet?: boolean } = {}): Promise<void> {
    const startedAt = ++listRevision;
    const mark = startLoad();
    if (!options.quiet || status.value !== 'ready') status.value = 'loading';
    error.value = null;
    try {
      const rows = await flagsApi.fetchFlags({ status: filters.status, farmId: filters.farmId ?? undefined, kind: filters.kind ?? undefined });
      if (listRevision !== startedAt) return;
      list.value = replay(rows, mark, true);
      status.value = 'ready';
    } catch (e) {
      if (listRevision !== startedAt) return;
      if (!options.quiet || status.value !== 'ready') {
        error.value = errorMessage(e);
        status.value = 'error';
      }
    } finally {
      endLoad();
    }
  }

  /** Replaces the filters and loads the list again. */
  function setFilters(next: Partial<FlagFilters>): Promise<void> {
    Object.assign(filters, next);
    return load();
  }

  let activeRevision = 0;
  async function loadActive(): Promise<void> {
    const startedAt = ++activeRevision;
    const mark = startLoad();
    if (activeStatus.value !== 'ready') activeStatus.value = 'loading';
    activeError.value = null;
    try {
      const rows = await flagsApi.fetchFlags({ status: 'active' });
      if (activeRevision !== startedAt) return;
      active.value = replay(rows, mark, false);
      activeStatus.value = 'ready';
    } catch (e) {
      if (activeRevision !== startedAt) return;
      if (activeStatus.value !== 'ready') {
        activeError.value = errorMessage(e);
        activeStatus.value = 'error';
      }
    } finally {
      endLoad();
    }
  }

  /** Applies one 'flags:farm' push: that farm's active flags are exactly `push.flags` now. */
  function applyFarmPush(push: FlagsFarmPush): void {
    record({ push });
    // Only a farm's flags are in a push: the board's list starts from a whole load, never from pushes alone.
    if (activeStatus.value === 'ready') active.value = mergePush(active.value, push, () => true);

    if (status.value !== 'ready') return;
    if (pushCoversList()) list.value = mergePush(list.value, push, (f) => flagMatches(f, filters));
    // A flag that left the push has cleared, but the push does not say when: the server does.
    else void load({ quiet: true });
  }

  function replaceFlag(flag: Flag): void {
    record({ flag });
    list.value = mergeFlag(list.value, flag);
    active.value = mergeFlag(active.value, flag);
  }

  /** Acknowledges a flag with what was done; the row shows it at once. Throws ApiError (409 when it cleared meanwhile). */
  async function acknowledge(id: number, note: string): Promise<Flag> {
    const flag = await flagsApi.acknowledgeFlag(id, note);
    replaceFlag(flag);
    return flag;
  }

  /** Clears a temperature flag by hand with why it is over: it leaves the active flags at once. Throws ApiError (409 when it is over already). */
  async function clearByHand(id: number, note: string): Promise<Flag> {
    const flag = await flagsApi.clearFlag(id, note);
    record({ flag });
    list.value = flagMatches(flag, filters) ? mergeFlag(list.value, flag) : list.value.filter((f) => f.id !== flag.id);
    active.value = active.value.filter((f) => f.id !== flag.id);
    return flag;
  }

  /** Follows pushes while the caller listens (and reloads after a lost connection); returns the stop function. */
  function listen(): () => void {
    return flagsApi.onFlagsPush(applyFarmPush, () => {
      if (activeStatus.value === 'ready') void loadActive();
      if (status.value === 'ready') void load({ quiet: true });
    });
  }

  function reset(): void {
    listRevision++;
    activeRevision++;
    changes = [];
    Object.assign(filters, { status: 'active', farmId: null, kind: null });
    list.value = [];
    status.value = 'idle';
    error.value = null;
    active.value = [];
    activeStatus.value = 'idle';
    activeError.value = null;
  }

  return {
    filters,
    list,
    status,
    error,
    active,
    activeStatus,
    activeError,
    activeByKind,
    openCount,
    load,
    setFilters,
    loadActive,
    applyFarmPush,
    acknowledge,
    clearByHand,
    listen,
    reset,
  };
});
