// Durations measured inside the server (the board request from its arrival to the end of its
// answer, a board change from its event to its delta going out), kept in histograms and handed to
// the process that started this one when it asks over the IPC channel (the board bench does).
import { createHistogram, type RecordableHistogram } from 'node:perf_hooks';
import type { AppContext } from './context';

/** What is timed. */
export type TimingName = 'board-request' | 'board-push';

/** One histogram read out, in milliseconds. */
export interface TimingSummary {
  count: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
}

const kept = new WeakMap<AppContext, Map<TimingName, RecordableHistogram>>();

function histogramOf(ctx: AppContext, name: TimingName): RecordableHistogram {
  let byName = kept.get(ctx);
  if (!byName) kept.set(ctx, (byName = new Map()));
  let h = byName.get(name);
  if (!h) byName.set(name, (h = createHistogram()));
  return h;
}

/** Records one duration (ms; kept to the microsecond). */
export function recordTiming(ctx: AppContext, name: TimingName, ms: number): void {
  histogramOf(ctx, name).record(Math.max(1, Math.round(ms * 1000)));
}

/** Every histogram's count and percentiles so far (ms). */
export function timingSummaries(ctx: AppContext): Partial<Record<TimingName, TimingSummary>> {
  const out: Partial<Record<TimingName, TimingSummary>> = {};
  for (const [name, h] of kept.get(ctx) ?? []) {
    out[name] = { count: h.count, p50Ms: h.percentile(50) / 1000, p95Ms: h.percentile(95) / 1000, p99Ms: h.percentile(99) / 1000, maxMs: h.max / 1000 };
  }
  return out;
}

/** Empties every histogram (the bench does so before each measured run). */
export function resetTimings(ctx: AppContext): void {
  for (const h of kept.get(ctx)?.values() ?? []) h.reset();
}

/** A request from the parent process: `{ type: 'timings', reset?: true }` answers `{ type: 'timings', summaries }`. */
interface TimingsAsk {
  type: 'timings';
  reset?: boolean;
}

/**
 * Answers timing requests on the IPC channel when this process has one (it is a child started with
 * 'ipc' in its stdio, as the bench starts it); does nothing otherwise. Returns the function that stops.
 */
export function answerTimingRequests(ctx: AppContext): () => void {
  if (!process.send) return () => undefined;
  const onMessage = (m: unknown) => {
    if (!m || typeof m !== 'object' || (m as TimingsAsk).type !== 'timings') return;
    const summaries = timingSummaries(ctx);
    if ((m as TimingsAsk).reset) resetTimings(ctx);
    process.send?.({ type: 'timings', summaries });
  };
  process.on('message', onMessage);
  return () => void process.off('message', onMessage);
}
