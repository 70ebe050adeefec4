import 'fake-indexeddb/auto';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { ApiError } from '@/api/http';
import { offerUpdate, updateWaiting } from '@/offline/app-update';
import type { OutboxRound } from '@/offline/db';
import { enqueueRound, listOutbox, outboxWaitMs, sendOutbox } from '@/offline/outbox';
import TheUpdatePrompt from '@/components/TheUpdatePrompt.vue';
import { freshDeviceDb } from './support/device';

const entry = (tankId: number, key: string) => ({ tankId, readingMm: 500, note: '', idempotencyKey: key.repeat(32) });
const queue = (farmId: number, key: string) => enqueueRound({ userId: 3, farmId, farmName: `Farm ${farmId}`, takenAt: '2026-03-02T09:30:00.000Z', entries: [entry(farmId, key)] });
const stored = (r: OutboxRound) => ({ results: r.entries.map((e) => ({ tankId: e.tankId, status: 'stored' as const })) });

beforeEach(async () => {
  await freshDeviceDb();
});

describe('outboxWaitMs', () => {
  it.each([
    [1, 5_000],
    [2, 10_000],
    [4, 40_000],
    [7, 300_000],
    [20, 300_000],
  ])('waits %i failed tries out for %i ms (doubling from 5 s, at most 5 min)', (attempts, ms) => {
    expect(outboxWaitMs(attempts)).toBe(ms);
  });
});

describe('sendOutbox', () => {
  it('sends waiting rounds oldest first with their own keys and time', async () => {
    await queue(11, 'a');
    await queue(12, 'b');
    const send = vi.fn(async (r: OutboxRound) => stored(r));

    const run = await sendOutbox(3, send);

    expect(send.mock.calls.map(([r]) => r.farmId)).toEqual([11, 12]);
    expect(send.mock.calls[0]![0].entries[0]!.idempotencyKey).toBe('a'.repeat(32));
    expect(run).toMatchObject({ retryInMs: null });
    expect((await listOutbox(3)).map((r) => r.status)).toEqual(['sent', 'sent']);
  });

  it('stops at the first round that does not get through, waits, and skips the wait when forced', async () => {
    await queue(11, 'a');
    await queue(12, 'b');
    const send = vi.fn<(r: OutboxRound) => Promise<{ results: [] }>>().mockRejectedValue(new ApiError(0, 'network', 'Cannot reach the server.'));
    const now = Date.parse('2026-03-02T10:00:00.000Z');

    const first = await sendOutbox(3, send, { now: () => now });
    expect(first.retryInMs).toBe(5_000);
    expect(send).toHaveBeenCalledTimes(1);
    const [waiting] = await listOutbox(3);
    expect(waiting).toMatchObject({ status: 'waiting', attempts: 1, lastErrorStatus: 0, nextTryAt: '2026-03-02T10:00:05.000Z' });

    const early = await sendOutbox(3, send, { now: () => now + 1_000 });
    expect(early.retryInMs).toBe(4_000);
    expect(send).toHaveBeenCalledTimes(1);

    await sendOutbox(3, send, { now: () => now + 1_000, force: true });
    expect(send).toHaveBeenCalledTimes(2);
    expect((await listOutbox(3))[0]!.attempts).toBe(2);
  });

  it('marks a round the server refuses as a whole and goes on with the next', async () => {
    await queue(11, 'a');
    await queue(12, 'b');
    const send = vi.fn(async (r: OutboxRound) => {
      if (r.farmId === 11) throw new ApiError(409, 'farm_archived', 'This farm is archived; restore it before entering readings');
      return stored(r);
    });

    await sendOutbox(3, send);

    const [refused, sent] = await listOutbox(3);
    expect(refused).toMatchObject({ status: 'refused', lastError: 'This farm is archived; restore it before entering readings', lastErrorStatus: 409 });
    expect(sent!.status).toBe('sent');
  });

  it('keeps a round waiting while the person is signed out (401) or the server is away (503)', async () => {
    await queue(11, 'a');
    for (const error of [new ApiError(401, 'unauthenticated', 'Please sign in again.'), new ApiError(503, 'database_down', 'The database is not reachable right now')]) {
      await sendOutbox(3, async () => Promise.reject(error), { force: true });
      expect((await listOutbox(3))[0]!.status).toBe('waiting');
    }
  });

  it('sends only the person’s own rounds', async () => {
    await queue(11, 'a');
    await enqueueRound({ userId: 4, farmId: 12, farmName: 'Farm 12', takenAt: '2026-03-02T09:30:00.000Z', entries: [entry(12, 'c')] });
    const send = vi.fn(async (r: OutboxRound) => stored(r));

    await sendOutbox(3, send);

    expect(send.mock.calls.map(([r]) => r.userId)).toEqual([3]);
  });
});

describe('TheUpdatePrompt', () => {
  it('offers a new version and switches to it only when asked', async () => {
    const switchToNew = vi.fn(async () => undefined);
    const wrapper = mount(TheUpdatePrompt, { global: { plugins: [[PrimeVue, { unstyled: true }]] } });
    expect(wrapper.find('[data-testid="update-prompt"]').exists()).toBe(false);

    offerUpdate(switchToNew);
    await wrapper.vm.$nextTick();
    expect(wrapper.get('[data-testid="update-prompt"]').text()).toContain('A new version of Brimstock is ready');
    expect(switchToNew).not.toHaveBeenCalled();

    await wrapper.get('[data-testid="update-later"]').trigger('click');
    expect(updateWaiting.value).toBe(false);
    expect(switchToNew).not.toHaveBeenCalled();

    offerUpdate(switchToNew);
    await wrapper.vm.$nextTick();
    await wrapper.get('[data-testid="update-reload"]').trigger('click');
    expect(switchToNew).toHaveBeenCalledTimes(1);
  });
});
