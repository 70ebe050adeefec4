import { ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type { TextFailure } from '@shared/schemas';
import * as authApi from '@/api/auth';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';

/** The signed-in person's flag texts that could not be delivered (shown on their Profile). */
export const useTextFailuresStore = defineStore('text-failures', () => {
  const failures = shallowRef<TextFailure[]>([]);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);

  async function load(): Promise<void> {
    status.value = 'loading';
    try {
      failures.value = await authApi.fetchTextFailures();
      status.value = 'ready';
    } catch (e) {
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  return { failures, status, error, load };
});
