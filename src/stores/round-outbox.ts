import { computed, shallowRef, ref, watch } from 'vue';
import { defineStore } from 'pinia';
import { errorMessage } from '@/api/http';
import { i18n } from '@/i18n';
import { submitRound } from '@/api/readings';
import type { OutboxRound } from '@/offline/db';
import { enqueueRound, listOutbox, markApplied, pruneAnswered, sendOutbox, type NewOutboxRound } from '@/offline/outbox';
import { useSessionStore } from './session';

type AnsweredListener = (rounds: OutboxRound[]) => Promise<void> | void;

/**
 * The rounds waiting on this device for the network, and those sent: sent oldest first on app start,
 * when the browser comes back online, and after a back-off while they do not get through.
 */
export const useRoundOutboxStore = defineStore('round-outbox', () => {
  const session = useSessionStore();
  const rounds = shallowRef<OutboxRound[]>([]);
  const sending = ref(false);
  /** Why the device's outbox could not be read or written, or null. */
  const problem = ref<string | null>(null);
  /** When the next try after a failure is due (ms since the epoch), or null. */
  const nextTryAt = ref<number | null>(null);
  const listeners = new Set<AnsweredListener>();
  let timer: ReturnType<typeof setTimeout> | null = null;
  let started = false;
  let again = false;

  const waiting = computed(() => rounds.value.filter((r) => r.status === 'waiting'));
  /** Answered rounds, newest first. */
  const answered = computed(() => rounds.value.filter((r) => r.status !== 'waiting').reverse());

  async function refresh(): Promise<void> {
    const id = session.user?.id;
    if (id === undefined) {
      rounds.value = [];
      return;
    }
    try {
      rounds.value = await listOutbox(id);
      problem.value = null;
    } catch (e) {
      problem.value = i18n.global.t('round.outbox.readUnreadable', { reason: errorMessage(e) });
    }
  }

  function schedule(inMs: number | null): void {
    if (timer) clearTimeout(timer);
    timer = null;
    nextTryAt.value = inMs === null ? null : Date.now() + inMs;
    // Only the app's own outbox (started in src/main.ts) tries again by itself.
    if (inMs !== null && started) timer = setTimeout(() => void flush(), inMs);
  }

  /** Tells the listeners (the round store) about answered rounds not yet written into their drafts. */
  async function deliver(): Promise<void> {
    const pending = rounds.value.filter((r) => r.status !== 'waiting' && !r.applied);
    if (!pending.length || !listeners.size) return;
    for (const listener of listeners) await listener(pending);
    for (const r of pending) await markApplied(r.seq!);
    await pruneAnswered(pending[0].userId);
    await refresh();
  }

  /** Sends what waits (`force` skips the back-off); a call while sending runs once more after it. */
  async function flush(force = false): Promise<void> {
    const id = session.user?.id;
    if (id === undefined) return;
    if (sending.value) {
      again = true;
      return;
    }
    sending.value = true;
    try {
      const run = await sendOutbox(id, (r) => submitRound({ farmId: r.farmId, takenAt: r.takenAt, entries: r.entries }), { force });
      schedule(run.retryInMs);
    } catch (e) {
      problem.value = i18n.global.t('round.outbox.sendFailed', { reason: errorMessage(e) });
    } finally {
      sending.value = false;
    }
    await refresh();
    await deliver();
    if (again) {
      again = false;
      await flush(force);
    }
  }

  /** Queues a round and tries to send it at once; returns its place in the queue. */
  async function add(round: Omit<NewOutboxRound, 'userId'>): Promise<number> {
    const id = session.user?.id;
    if (id === undefined) throw new Error(i18n.global.t('round.problems.signInFirst'));
    const seq = await enqueueRound({ ...round, userId: id });
    await refresh();
    return seq;
  }

  /** Registers what to do with answered rounds (the round store writes them into the drafts). */
  function onAnswered(listener: AnsweredListener): () => void {
    listeners.add(listener);
    void deliver();
    return () => listeners.delete(listener);
  }

  /** Starts sending: now, whenever the browser is back online, and for each person who signs in. */
  function start(): void {
    if (started || typeof window === 'undefined') return;
    started = true;
    window.addEventListener('online', () => void flush(true));
    watch(
      () => session.user?.id ?? null,
      async () => {
        schedule(null);
        await refresh();
        await flush(true);
      },
      { immediate: true },
    );
  }

  return { rounds, waiting, answered, sending, problem, nextTryAt, refresh, flush, add, onAnswered, start };
});
