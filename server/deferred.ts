// Work that runs after the answer has gone out (mail above all): a request never waits for it, so
// its answer takes the same time whatever the work finds, and a failure is logged, never thrown.
// Shutdown waits for what is still running (settleDeferred) before closing the database.
import type { AppContext } from './context';

const running = new WeakMap<object, Set<Promise<void>>>();

// Keyed by the database, which every copy of a context shares with the one that closes it.
const jobsOf = (ctx: AppContext) => {
  let jobs = running.get(ctx.db);
  if (!jobs) running.set(ctx.db, (jobs = new Set()));
  return jobs;
};

/** Runs `work` on a later turn of the event loop; an error is logged with `what`. */
export function defer(ctx: AppContext, what: string, work: () => Promise<void>): void {
  const jobs = jobsOf(ctx);
  const job: Promise<void> = new Promise<void>((resolve) => setImmediate(resolve))
    .then(work)
    .catch((err) => ctx.logger.error({ err }, `${what} failed`))
    .finally(() => jobs.delete(job));
  jobs.add(job);
}

/** Resolves once every deferred job of this database has finished (including ones they started). */
export async function settleDeferred(ctx: AppContext): Promise<void> {
  const jobs = jobsOf(ctx);
  while (jobs.size) await Promise.all([...jobs]);
}
