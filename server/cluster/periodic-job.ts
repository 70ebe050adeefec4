// A background job on a timer that runs once per period across the server processes: every
// process ticks, and only the one whose tick claims the period's slot does the work.
import type { AppContext } from '../context';
import { clusterOf } from './index';
import { claimSlot, slotOf } from './job-lock';

export interface PeriodicJob {
  /** The job's name: its claims' key and what the log says. */
  name: string;
  periodMs: number;
  /** Once this long after start, claimed under `${name}-start` for a slot of `startSlotMs`; omitted: not. */
  firstAfterMs?: number;
  startSlotMs?: number;
  work(): Promise<unknown>;
}

/**
 * Runs `job.work` when this process wins the claim of the period (an error is logged and the
 * next period tries again; so is a claim that cannot reach Redis). Returns the function that stops it.
 */
export function startPeriodicJob(ctx: AppContext, job: PeriodicJob): () => void {
  const { locks } = clusterOf(ctx);
  let running: Promise<void> = Promise.resolve();
  const attempt = (claimName: string, slotMs: number) => {
    const now = Date.now();
    running = running
      .then(async () => {
        if (!(await claimSlot(locks, claimName, slotMs, now))) return;
        ctx.logger.debug({ event: 'job', job: claimName, slot: slotOf(now, slotMs), pid: process.pid }, `background job ${claimName} runs`);
        await job.work();
      })
      .catch((err: unknown) => ctx.logger.error({ err, job: claimName }, `background job ${claimName} failed; trying again next time`));
  };
  const timer = setInterval(() => attempt(job.name, job.periodMs), job.periodMs);
  timer.unref();
  const first = job.firstAfterMs === undefined ? null : setTimeout(() => attempt(`${job.name}-start`, job.startSlotMs ?? 60_000), job.firstAfterMs);
  first?.unref();
  return () => {
    clearInterval(timer);
    if (first) clearTimeout(first);
  };
}
