import { reactive, ref, toValue, watch, type MaybeRefOrGetter, type Ref, type UnwrapNestedRefs, type WatchSource } from 'vue';
import type { z } from 'zod';
import { useFormErrors } from './useFormErrors';

export interface UseDialogFormOptions<F extends object, S extends z.ZodType, R> {
  /** The dialog's v-model: opening it fills the form afresh; a save closes it. */
  visible: Ref<boolean>;
  /** The form's values each time the dialog opens (or `refillOn` changes while it is open). */
  initial: () => F;
  /** What else refills an open form when it changes, e.g. `() => props.farm`. */
  refillOn?: WatchSource | WatchSource[];
  /** Fields this form shows; errors on other paths go to `formError`. */
  fields: readonly string[];
  /** Map of API error code → field, for errors the server sends without `field`. */
  codeFields?: Record<string, string>;
  /** The shared schema the values are checked with (a getter when it depends on props). */
  schema: MaybeRefOrGetter<S>;
  /** What is checked and sent, made from the form (the form itself when left out). */
  values?: (form: UnwrapNestedRefs<F>) => unknown;
  /** Form keys whose error goes as soon as the key is edited, each with the field its error is under. */
  clearOnEdit?: Partial<Record<keyof F & string, string>>;
  /** Runs after a failed check, e.g. to put plainer words on zod's messages. */
  afterCheckFailed?: () => void;
  /** Sends the checked values; what it returns goes to `saved`. */
  submit: (values: z.output<S>) => Promise<R>;
  /** Runs once the dialog has closed after a save. */
  saved?: (result: R) => void;
  /** Runs after a server error has been placed (under its field or for the whole form). */
  failed?: (error: unknown) => void;
}

export interface UseDialogForm<F extends object> {
  form: UnwrapNestedRefs<F>;
  /** Per-field messages, keyed by field name. */
  errors: Ref<Record<string, string>>;
  /** A message for the whole form: a server error naming none of its fields, or a check on another path. */
  formError: Ref<string | null>;
  /** True while the values are being sent. */
  busy: Ref<boolean>;
  /** Check, send, close and report; does nothing while a send is under way. */
  submit: () => Promise<void>;
  /** Fill the form from `initial` and clear every message. */
  reset: () => void;
  /** Close without saving. */
  cancel: () => void;
}

/** The state every form dialog keeps: values filled on open, checked with a shared schema, sent once, errors placed. */
export function useDialogForm<F extends object, S extends z.ZodType, R>(options: UseDialogFormOptions<F, S, R>): UseDialogForm<F> {
  const form = reactive(options.initial()) as UnwrapNestedRefs<F>;
  const { errors, formError, validate, showServerError, clear } = useFormErrors({ fields: options.fields, codeFields: options.codeFields });
  const busy = ref(false);

  function reset(): void {
    Object.assign(form, options.initial());
    clear();
  }

  const extra = options.refillOn === undefined ? [] : Array.isArray(options.refillOn) ? options.refillOn : [options.refillOn];
  watch(
    [options.visible, ...extra],
    ([open]) => {
      if (open) reset();
    },
    { immediate: true },
  );

  for (const [key, field] of Object.entries(options.clearOnEdit ?? {}) as [string, string][]) {
    watch(
      () => (form as Record<string, unknown>)[key],
      () => {
        if (errors.value[field]) errors.value = { ...errors.value, [field]: '' };
      },
    );
  }

  async function submit(): Promise<void> {
    if (busy.value) return;
    const values = validate(toValue(options.schema), options.values ? options.values(form) : form);
    if (values === null) {
      options.afterCheckFailed?.();
      return;
    }
    busy.value = true;
    try {
      const result = await options.submit(values);
      options.visible.value = false;
      options.saved?.(result);
    } catch (error) {
      showServerError(error);
      options.failed?.(error);
    } finally {
      busy.value = false;
    }
  }

  function cancel(): void {
    options.visible.value = false;
  }

  return { form, errors, formError, busy, submit, reset, cancel };
}

export interface UseEditDialogFormOptions<F extends object, Row, C extends z.ZodType, U extends z.ZodType, R>
  extends Omit<UseDialogFormOptions<F, z.ZodType, readonly [R, boolean]>, 'initial' | 'refillOn' | 'schema' | 'submit' | 'saved'> {
  /** The row being edited, or null to create one; a change while open refills the form. */
  row: () => Row | null;
  /** The form's values for the row (or for a new one). */
  initial: (row: Row | null) => F;
  createSchema: C;
  updateSchema: U;
  create: (values: z.output<C>) => Promise<R>;
  update: (row: Row, values: z.output<U>) => Promise<R>;
  /** Runs once the dialog has closed after a save, with whether a new row was made. */
  saved?: (result: R, created: boolean) => void;
}

/** useDialogForm for a dialog that edits a row or makes a new one: the update schema and call for a row, the create ones without. */
export function useEditDialogForm<F extends object, Row, C extends z.ZodType, U extends z.ZodType, R>(
  options: UseEditDialogFormOptions<F, Row, C, U, R>,
): UseDialogForm<F> {
  const { row, initial, createSchema, updateSchema, create, update, saved, ...rest } = options;
  // The schema and the call are chosen by the same row, so what `update` gets has passed `updateSchema`.
  return useDialogForm<F, z.ZodType, readonly [R, boolean]>({
    ...rest,
    refillOn: row,
    initial: () => initial(row()),
    schema: () => (row() === null ? createSchema : updateSchema),
    submit: async (values) => {
      const editing = row();
      return editing === null ? [await create(values as z.output<C>), true] : [await update(editing, values as z.output<U>), false];
    },
    saved: saved && (([result, created]) => saved(result, created)),
  });
}
