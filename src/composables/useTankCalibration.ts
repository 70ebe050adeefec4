import { ref, shallowRef, watch, type Ref } from 'vue';
import type { UnitSystem } from '@shared/schemas';
import { fetchCalibration, type CalibrationTable } from '@/api/tanks';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from '@/stores/farms';

/** Table steps offered per unit system: mm for metric, inches for US. */
export const CALIBRATION_STEPS: Readonly<Record<UnitSystem, readonly number[]>> = {
  metric: [1, 5, 10, 50, 100],
  us: [0.25, 0.5, 1, 2, 4],
};

export interface UseTankCalibrationOptions {
  tankId: Ref<number>;
  step: Ref<number>;
  unit: Ref<UnitSystem>;
  /** Changes when the tank's calibration does, so the table is fetched again. */
  version: Ref<string | undefined>;
}

/** The tank's calibration table at the chosen step, in the user's units. */
export function useTankCalibration(options: UseTankCalibrationOptions) {
  const table = shallowRef<CalibrationTable | null>(null);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);
  let ticket = 0;

  async function load(): Promise<void> {
    const mine = ++ticket;
    status.value = 'loading';
    error.value = null;
    try {
      const fresh = await fetchCalibration(options.tankId.value, options.step.value, options.unit.value);
      if (mine !== ticket) return;
      table.value = fresh;
      status.value = 'ready';
    } catch (e) {
      if (mine !== ticket) return;
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  watch([options.tankId, options.step, options.unit, options.version], () => void load(), { immediate: true });

  return { table, status, error, reload: load };
}
