import { computed, ref, toValue, type ComputedRef, type MaybeRefOrGetter, type Ref } from 'vue';
import { useConfirm } from 'primevue/useconfirm';
import { useToast } from 'primevue/usetoast';
import { errorMessage } from '@/api/http';

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
  /** What one row is called in the messages, capitalised: `Farm`, `Supplier`. */
  noun: string;
  /** What archiving keeps and changes, asked before it is done. */
  archiveMessage: string;
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

/** The archived/active switch of a list view and its archive and restore actions. */
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
      toast.add({ severity: 'success', summary: `${options.noun} ${archived ? 'archived' : 'restored'}`, detail: row.name, life: 4000 });
    } catch (error) {
      toast.add({ severity: 'error', summary: 'Not changed', detail: errorMessage(error), life: 7000 });
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
    confirm.require({
      header: `Archive ${row.name}?`,
      message: options.archiveMessage,
      icon: 'pi pi-box',
      acceptProps: { label: 'Archive', severity: 'warn' },
      rejectProps: { label: 'Cancel', severity: 'secondary', variant: 'text' },
      accept: () => run(row, true),
    });
  }

  return { showArchived, shown, busyId, setArchived };
}
