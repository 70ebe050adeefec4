import { ref, shallowRef, watch, type Ref } from 'vue';
import type { CorrectionInput, Reading } from '@shared/schemas';
import { correctReading, fetchReadings } from '@/api/readings';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from '@/stores/farms';

export interface UseTankReadingsOptions {
  tankId: Ref<number>;
  /** How many of the newest readings to show. */
  limit?: number;
}

/** A tank's newest readings (corrected ones and their corrections included) and the correct action. */
export function useTankReadings(options: UseTankReadingsOptions) {
  const readings = shallowRef<Reading[]>([]);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);
  let ticket = 0;

  async function load(): Promise<void> {
    const mine = ++ticket;
    status.value = 'loading';
    error.value = null;
    try {
      const fresh = await fetchReadings(options.tankId.value, { limit: options.limit ?? 200 });
      if (mine !== ticket) return;
      readings.value = fresh;
      status.value = 'ready';
    } catch (e) {
      if (mine !== ticket) return;
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  /** Stores a correction of `readingId`, then reloads so the original shows struck through beside it. */
  async function correct(readingId: number, input: CorrectionInput): Promise<Reading> {
    const created = await correctReading(readingId, input);
    await load();
    return created;
  }

  watch(options.tankId, () => void load(), { immediate: true });

  return { readings, status, error, reload: load, correct };
}
