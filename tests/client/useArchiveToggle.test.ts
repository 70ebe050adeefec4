import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { computed, defineComponent, h, ref } from 'vue';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { ApiError } from '@/api/http';
import { useArchiveToggle, type ArchivableRow, type UseArchiveToggle } from '@/composables/useArchiveToggle';
import { mountWithApp } from './support/mountApp';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn().mockResolvedValue(null), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));

const rows = ref<ArchivableRow[]>([]);
const archive = vi.fn<(id: number) => Promise<unknown>>();
const restore = vi.fn<(id: number) => Promise<unknown>>();
let toggle: UseArchiveToggle<ArchivableRow>;
let pinia: Pinia;

/** A list view in miniature: the composable in a component, beside the app's ConfirmDialog and Toast. */
const ListView = defineComponent({
  setup() {
    toggle = useArchiveToggle({
      all: rows,
      active: computed(() => rows.value.filter((r) => r.archivedAt === null)),
      archivedSummary: 'Barrel archived',
      restoredSummary: () => 'Barrel restored',
      archiveMessage: 'It leaves the lists; its history is kept.',
      archive,
      restore,
    });
    return () => h('ul', toggle.shown.value.map((r) => h('li', { 'data-testid': `row-${r.id}` }, r.name)));
  },
});

const buttonNamed = (label: string) => [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === label);
const toastText = () => document.querySelector('[data-pc-name="toast"]')?.textContent ?? '';

beforeEach(() => {
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  rows.value = [
    { id: 1, name: 'Rain barrel', archivedAt: null },
    { id: 2, name: 'Old drum', archivedAt: '2026-01-05T00:00:00.000Z' },
  ];
  archive.mockReset();
  restore.mockReset();
});

describe('useArchiveToggle', () => {
  it('lists the active rows until the switch is on, then every row', async () => {
    await mountWithApp(ListView, { pinia });
    expect(toggle.shown.value.map((r) => r.id)).toEqual([1]);
    toggle.showArchived.value = true;
    expect(toggle.shown.value.map((r) => r.id)).toEqual([1, 2]);
  });

  it('asks before archiving and archives only once accepted, with a toast naming the row', async () => {
    archive.mockResolvedValue(undefined);
    await mountWithApp(ListView, { pinia });
    toggle.setArchived(rows.value[0]!, true);
    await flushPromises();
    expect(document.body.textContent).toContain('Archive Rain barrel?');
    expect(document.body.textContent).toContain('It leaves the lists; its history is kept.');
    expect(archive).not.toHaveBeenCalled();
    buttonNamed('Archive')!.click();
    await flushPromises();
    expect(archive).toHaveBeenCalledWith(1);
    expect(toastText()).toContain('Barrel archived');
    expect(toastText()).toContain('Rain barrel');
    expect(toggle.busyId.value).toBeNull();
  });

  it('archives nothing when the question is cancelled', async () => {
    await mountWithApp(ListView, { pinia });
    toggle.setArchived(rows.value[0]!, true);
    await flushPromises();
    buttonNamed('Cancel')!.click();
    await flushPromises();
    expect(archive).not.toHaveBeenCalled();
  });

  it('restores at once, busy on that row while the call is under way', async () => {
    let done: () => void = () => undefined;
    restore.mockReturnValue(new Promise<void>((resolve) => (done = resolve)));
    await mountWithApp(ListView, { pinia });
    toggle.setArchived(rows.value[1]!, false);
    expect(restore).toHaveBeenCalledWith(2);
    expect(toggle.busyId.value).toBe(2);
    done();
    await flushPromises();
    expect(toggle.busyId.value).toBeNull();
    expect(toastText()).toContain('Barrel restored');
  });

  it('says why when the server refuses, and is no longer busy', async () => {
    restore.mockRejectedValue(new ApiError(409, 'code_taken', 'Another barrel on the farm has this code'));
    await mountWithApp(ListView, { pinia });
    toggle.setArchived(rows.value[1]!, false);
    await flushPromises();
    expect(toastText()).toContain('Not changed');
    expect(toastText()).toContain('Another barrel on the farm has this code');
    expect(toggle.busyId.value).toBeNull();
  });
});
