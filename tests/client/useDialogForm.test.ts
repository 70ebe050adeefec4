import { describe, expect, it, vi } from 'vitest';
import { effectScope, nextTick, ref } from 'vue';
import { z } from 'zod';
import { ApiError } from '@/api/http';
import { useDialogForm, type UseDialogFormOptions } from '@/composables/useDialogForm';

const schema = z.object({ name: z.string().trim().min(1, 'Type a name'), litres: z.number().positive('More than 0 L') });
type Form = { name: string; litres: number | null };

/** A dialog's form in its own scope, as a component's setup would hold it. */
function dialogForm(overrides: Partial<UseDialogFormOptions<Form, typeof schema, string>> = {}) {
  const visible = ref(false);
  const row = ref<{ name: string; litres: number } | null>(null);
  const submit = vi.fn(async (values: z.output<typeof schema>) => `saved ${values.name}`);
  const saved = vi.fn();
  const scope = effectScope();
  const dialog = scope.run(() =>
    useDialogForm({
      visible,
      refillOn: () => row.value,
      initial: (): Form => ({ name: row.value?.name ?? '', litres: row.value?.litres ?? null }),
      fields: ['name', 'litres'],
      codeFields: { name_taken: 'name' },
      schema,
      submit,
      saved,
      ...overrides,
    }),
  )!;
  return { visible, row, submit, saved, dialog, scope };
}

describe('useDialogForm', () => {
  it('fills the form from initial when the dialog opens, and again when the row changes while open', async () => {
    const { visible, row, dialog } = dialogForm();
    dialog.form.name = 'typed before opening';
    row.value = { name: 'East tank', litres: 400 };
    visible.value = true;
    await nextTick();
    expect(dialog.form).toEqual({ name: 'East tank', litres: 400 });
    row.value = { name: 'West tank', litres: 90 };
    await nextTick();
    expect(dialog.form).toEqual({ name: 'West tank', litres: 90 });
  });

  it('puts the shared schema’s messages under their fields and sends nothing when the check fails', async () => {
    const afterCheckFailed = vi.fn();
    const { visible, dialog, submit } = dialogForm({ afterCheckFailed });
    visible.value = true;
    await nextTick();
    dialog.form.litres = 0;
    await dialog.submit();
    expect(dialog.errors.value).toEqual({ name: 'Type a name', litres: 'More than 0 L' });
    expect(submit).not.toHaveBeenCalled();
    expect(afterCheckFailed).toHaveBeenCalledOnce();
    expect(visible.value).toBe(true);
  });

  it('sends the checked values (trimmed by the schema), closes, then reports the result', async () => {
    const { visible, dialog, submit, saved } = dialogForm();
    visible.value = true;
    await nextTick();
    Object.assign(dialog.form, { name: '  North tank ', litres: 1200 });
    await dialog.submit();
    expect(submit).toHaveBeenCalledWith({ name: 'North tank', litres: 1200 });
    expect(visible.value).toBe(false);
    expect(saved).toHaveBeenCalledWith('saved North tank');
    expect(dialog.busy.value).toBe(false);
  });

  it('checks what `values` makes from the form when given', async () => {
    const { visible, dialog, submit } = dialogForm({ values: (f) => ({ name: f.name, litres: (f.litres ?? 0) * 1000 }) });
    visible.value = true;
    await nextTick();
    Object.assign(dialog.form, { name: 'Tote', litres: 1 });
    await dialog.submit();
    expect(submit).toHaveBeenCalledWith({ name: 'Tote', litres: 1000 });
  });

  it('puts a server error under the field it names (or its code’s field) and keeps the dialog open', async () => {
    const failed = vi.fn();
    const refusal = new ApiError(409, 'name_taken', 'That name is used on this farm');
    const { visible, dialog, saved } = dialogForm({ submit: () => Promise.reject(refusal), failed });
    visible.value = true;
    await nextTick();
    Object.assign(dialog.form, { name: 'East tank', litres: 5 });
    await dialog.submit();
    expect(dialog.errors.value).toEqual({ name: 'That name is used on this farm' });
    expect(dialog.formError.value).toBeNull();
    expect(failed).toHaveBeenCalledWith(refusal);
    expect(saved).not.toHaveBeenCalled();
    expect(visible.value).toBe(true);
    expect(dialog.busy.value).toBe(false);
  });

  it('shows a server error naming no field of the form for the whole form', async () => {
    const { visible, dialog } = dialogForm({ submit: () => Promise.reject(new ApiError(500, 'internal', 'Something went wrong on the server')) });
    visible.value = true;
    await nextTick();
    Object.assign(dialog.form, { name: 'East tank', litres: 5 });
    await dialog.submit();
    expect(dialog.errors.value).toEqual({});
    expect(dialog.formError.value).toBe('Something went wrong on the server');
  });

  it('is busy while sending and ignores a second submit until the first is answered', async () => {
    let answer: (value: string) => void = () => undefined;
    const submit = vi.fn(() => new Promise<string>((resolve) => (answer = resolve)));
    const { visible, dialog } = dialogForm({ submit });
    visible.value = true;
    await nextTick();
    Object.assign(dialog.form, { name: 'East tank', litres: 5 });
    const first = dialog.submit();
    expect(dialog.busy.value).toBe(true);
    await dialog.submit();
    expect(submit).toHaveBeenCalledOnce();
    answer('done');
    await first;
    expect(dialog.busy.value).toBe(false);
  });

  it('takes away a field’s message once that field is edited, when asked to', async () => {
    const { visible, dialog } = dialogForm({ clearOnEdit: { name: 'name' } });
    visible.value = true;
    await nextTick();
    await dialog.submit();
    expect(dialog.errors.value.name).toBe('Type a name');
    dialog.form.name = 'E';
    await nextTick();
    expect(dialog.errors.value.name).toBeFalsy();
    expect(dialog.errors.value.litres).toBeTruthy();
  });

  it('clears the messages on reopening, and cancel closes without sending', async () => {
    const { visible, dialog, submit } = dialogForm();
    visible.value = true;
    await nextTick();
    await dialog.submit();
    expect(Object.keys(dialog.errors.value)).toHaveLength(2);
    dialog.cancel();
    expect(visible.value).toBe(false);
    await nextTick();
    visible.value = true;
    await nextTick();
    expect(dialog.errors.value).toEqual({});
    expect(submit).not.toHaveBeenCalled();
  });

  it('picks the schema from a getter at each submit', async () => {
    const strict = ref(true);
    const loose = z.object({ name: z.string(), litres: z.number().nullable() });
    const submit = vi.fn(async () => 'ok');
    const { visible, dialog } = dialogForm({ schema: () => (strict.value ? schema : loose) as typeof schema, submit });
    visible.value = true;
    await nextTick();
    await dialog.submit();
    expect(submit).not.toHaveBeenCalled();
    strict.value = false;
    await dialog.submit();
    expect(submit).toHaveBeenCalledWith({ name: '', litres: null });
  });
});
