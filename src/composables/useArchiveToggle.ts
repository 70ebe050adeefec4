import { computed, ref, toValue, type ComputedRef, type MaybeRefOrGetter, type Ref } from 'vue';
import { useConfirm } from 'primevue/useconfirm';
import { useToast } from 'primevue/usetoast';
import { errorMessage } from '@/api/http';
import { i18n } from '@/i18n';

/** A row a list view can archive and restore. */
export interface ArchivableRow {
  id: number;
  name: string;
  archivedAt: string | null;
}

export interface UseArchiveToggleOptions<T extends ArchivableRow> {
  /** Every row, archived ones included. */
  all: MaybeRefOrGetter<readonly T[]>;
  /** The rows not archived. */
  active: MaybeRefOrGetter<readonly T[]>;
  /** The toast's title once a row is archived ("Farm archived"): a whole phrase, since the noun's gender changes it in other languages. */
  archivedSummary: MaybeRefOrGetter<string>;
  /** The toast's title once a row is restored ("Farm restored"). */
  restoredSummary: MaybeRefOrGetter<string>;
  /** What archiving keeps and changes, asked before it is done. */
  archiveMessage: MaybeRefOrGetter<string>;
  archive: (id: number) => Promise<unknown>;
  restore: (id: number) => Promise<unknown>;
}

export interface UseArchiveToggle<T extends ArchivableRow> {
  /** The "Show archived" switch. */
  showArchived: Ref<boolean>;
  /** The rows to list: every row with the switch on, else the active ones. */
  shown: ComputedRef<readonly T[]>;
  /** The row being archived or restored, for its button's spinner. */
  busyId: Ref<number | null>;
  /** Archive (after asking) or restore a row, with a toast either way. */
  setArchived: (row: T, archived: boolean) => void;
}

/** The archived/active switch of a list view and its archive and restore actions (its own words in area farms, archiveToggle). */
export function useArchiveToggle<T extends ArchivableRow>(options: UseArchiveToggleOptions<T>): UseArchiveToggle<T> {
  const confirm = useConfirm();
  const toast = useToast();
  const showArchived = ref(false);
  const busyId = ref<number | null>(null);
  const shown = computed(() => (showArchived.value ? toValue(options.all) : toValue(options.active)));

  async function run(row: T, archived: boolean): Promise<void> {
    busyId.value = row.id;
    try {
      await (archived ? options.archive(row.id) : options.restore(row.id));
      toast.add({ severity: 'success', summary: toValue(archived ? options.archivedSummary : options.restoredSummary), detail: row.name, life: 4000 });
    } catch (error) {
      toast.add({ severity: 'error', summary: i18n.global.t('farms.archiveToggle.notChanged'), detail: errorMessage(error), life: 7000 });
    } finally {
      busyId.value = null;
    }
  }

  function setArchived(row: T, archived: boolean): void {
    // Restoring loses nothing, so it is done at once; archiving is asked first.
    if (!archived) {
      void run(row, false);
      return;
    }
    const { t } = i18n.global;
    confirm.require({
      header: t('farms.archiveToggle.question', { name: row.name }),
      message: toValue(options.archiveMessage),
      icon: 'pi pi-box',
      acceptProps: { label: t('farms.archiveToggle.archive'), severity: 'warn' },
      rejectProps: { label: t('common.cancel'), severity: 'secondary', variant: 'text' },
      accept: () => run(row, true),
    });
  }

  return { showArchived, shown, busyId, setArchived };
}
