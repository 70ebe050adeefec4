import { ref } from 'vue';
import { defineStore } from 'pinia';
import type { FarmFrost } from '@shared/schemas';
import { fetchFarmFrost } from '@/api/farms';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';

/** Each farm's 48-hour air forecast and frost threshold, as the farm page shows them. */
export const useFrostStore = defineStore('frost', () => {
  const byFarm = ref<Record<number, FarmFrost>>({});
  const status = ref<Record<number, LoadStatus>>({});
  const error = ref<Record<number, string | null>>({});

  async function load(farmId: number): Promise<void> {
    status.value[farmId] = 'loading';
    error.value[farmId] = null;
    try {
      byFarm.value[farmId] = await fetchFarmFrost(farmId);
      status.value[farmId] = 'ready';
    } catch (e) {
      error.value[farmId] = errorMessage(e);
      status.value[farmId] = 'error';
    }
  }

  return { byFarm, status, error, load };
});
