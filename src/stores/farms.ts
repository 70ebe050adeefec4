import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type { Farm, FarmCreateInput, FarmUpdateInput } from '@shared/schemas';
import * as farmsApi from '@/api/farms';
import { errorMessage } from '@/api/http';

export type LoadStatus = 'idle' | 'loading' | 'ready' | 'error';

function byName(a: Farm, b: Farm): number {
  return a.name.localeCompare(b.name);
}

/** The farms the signed-in user may see, archived ones included (views filter them). */
export const useFarmsStore = defineStore('farms', () => {
  const farms = shallowRef<Farm[]>([]);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);

  const activeFarms = computed(() => farms.value.filter((f) => f.archivedAt === null));
  const archivedFarms = computed(() => farms.value.filter((f) => f.archivedAt !== null));
  const byId = computed(() => new Map(farms.value.map((f) => [f.id, f])));

  async function load(): Promise<void> {
    status.value = 'loading';
    error.value = null;
    try {
      farms.value = (await farmsApi.fetchFarms({ includeArchived: true })).slice().sort(byName);
      status.value = 'ready';
    } catch (e) {
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  /** Loads unless a load already succeeded or is running. */
  async function ensureLoaded(): Promise<void> {
    if (status.value === 'idle' || status.value === 'error') await load();
  }

  function put(farm: Farm): Farm {
    const others = farms.value.filter((f) => f.id !== farm.id);
    farms.value = [...others, farm].sort(byName);
    return farm;
  }

  async function create(input: FarmCreateInput): Promise<Farm> {
    return put(await farmsApi.createFarm(input));
  }

  async function update(farmId: number, input: FarmUpdateInput): Promise<Farm> {
    return put(await farmsApi.updateFarm(farmId, input));
  }

  const archive = (farmId: number) => update(farmId, { archived: true });
  const restore = (farmId: number) => update(farmId, { archived: false });

  function reset(): void {
    farms.value = [];
    status.value = 'idle';
    error.value = null;
  }

  return { farms, status, error, activeFarms, archivedFarms, byId, load, ensureLoaded, create, update, archive, restore, reset };
});
