import { ref, shallowRef, watch, type Ref } from 'vue';
import type { SeriesPoint } from '@shared/schemas';
import { fetchSeries } from '@/api/readings';
import { errorMessage } from '@/api/http';
import { i18n } from '@/i18n';
import type { LoadStatus } from '@/stores/farms';

type SeriesBucket = 'raw' | 'hour' | 'day' | 'week';

/** One history window: its name in the current language (read when shown), its length and its bucket. */
interface WindowSpec<B extends SeriesBucket> {
  readonly label: string;
  readonly days: number;
  readonly bucket: B;
}

function windowSpec<B extends SeriesBucket>(key: string, days: number, bucket: B): WindowSpec<B> {
  return {
    get label() {
      return i18n.global.t(`tank.history.windows.${key}`);
    },
    days,
    bucket,
  };
}

/** The history windows the tank page offers, each with the bucket that keeps its chart readable. */
export const SERIES_WINDOWS = {
  day: windowSpec('day', 1, 'raw'),
  week: windowSpec('week', 7, 'hour'),
  month: windowSpec('month', 30, 'day'),
  quarter: windowSpec('quarter', 90, 'day'),
} as const;
export type SeriesWindow = keyof typeof SERIES_WINDOWS;

const DAY_MS = 86_400_000;

export interface UseTankSeriesOptions {
  tankId: Ref<number>;
  window: Ref<SeriesWindow>;
}

/** A tank's level and volume series over the chosen window, refetched when the tank or window changes. */
export function useTankSeries(options: UseTankSeriesOptions) {
  const points = shallowRef<SeriesPoint[]>([]);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);
  /** The period the points were asked for, as epoch ms, so a chart can span all of it. */
  const range = shallowRef<{ fromMs: number; toMs: number } | null>(null);
  let ticket = 0;

  async function load(): Promise<void> {
    const mine = ++ticket;
    const spec = SERIES_WINDOWS[options.window.value];
    const to = new Date();
    const from = new Date(to.getTime() - spec.days * DAY_MS);
    status.value = 'loading';
    error.value = null;
    try {
      const fresh = await fetchSeries(options.tankId.value, { from: from.toISOString(), to: to.toISOString(), bucket: spec.bucket });
      // A slower answer for an earlier choice must not overwrite the current one.
      if (mine !== ticket) return;
      points.value = fresh;
      range.value = { fromMs: from.getTime(), toMs: to.getTime() };
      status.value = 'ready';
    } catch (e) {
      if (mine !== ticket) return;
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  watch([options.tankId, options.window], () => void load(), { immediate: true });

  return { points, range, status, error, reload: load };
}
