import { ref, type Ref } from 'vue';
import { fieldErrors } from '@shared/schemas';
import type { z } from 'zod';
import { ApiError, errorMessage } from '@/api/http';
import { sayError } from '@/i18n';

export interface UseFormErrorsOptions {
  /** Fields this form shows; a server error naming one of them goes under that field. */
  fields: readonly string[];
  /** Map of API error code → field, for errors the server sends without `field`. */
  codeFields?: Record<string, string>;
}

export interface UseFormErrors {
  /** Per-field messages, keyed by field name. */
  errors: Ref<Record<string, string>>;
  /** A message for the whole form (server errors that name no field of this form). */
  formError: Ref<string | null>;
  /** Parse `data` with the shared schema; on failure fill `errors` and return null. */
  validate<S extends z.ZodType>(schema: S, data: unknown): z.output<S> | null;
  /** Place an error thrown by an API call; returns true when it went under a field. */
  showServerError(error: unknown): boolean;
  clear(): void;
}

/** Strips the "field: " prefix the server puts in front of field messages. */
export function withoutFieldPrefix(message: string, field: string): string {
  const prefix = `${field}: `;
  return message.startsWith(prefix) ? message.slice(prefix.length) : message;
}

/** Form error state fed by the shared zod schemas and by ApiError's `field`. */
export function useFormErrors(options: UseFormErrorsOptions): UseFormErrors {
  const errors = ref<Record<string, string>>({});
  const formError = ref<string | null>(null);

  function clear(): void {
    errors.value = {};
    formError.value = null;
  }

  function validate<S extends z.ZodType>(schema: S, data: unknown): z.output<S> | null {
    clear();
    const result = schema.safeParse(data);
    if (result.success) return result.data;
    const all = fieldErrors(result.error);
    const shown: Record<string, string> = {};
    const rest: string[] = [];
    for (const [path, english] of Object.entries(all)) {
      // The schemas write English; the catalogue says what it knows in the screens' language.
      const message = sayError(english);
      // "farmIds.2" belongs under the farmIds field.
      const field = options.fields.find((f) => path === f || path.startsWith(`${f}.`));
      if (field) shown[field] ??= message;
      else rest.push(path === '_' ? message : `${path}: ${message}`);
    }
    errors.value = shown;
    if (rest.length) formError.value = rest.join(' ');
    return null;
  }

  function showServerError(error: unknown): boolean {
    if (error instanceof ApiError) {
      const field = error.field && options.fields.includes(error.field) ? error.field : options.codeFields?.[error.code];
      if (field) {
        errors.value = { ...errors.value, [field]: withoutFieldPrefix(error.message, error.field ?? field) };
        return true;
      }
    }
    formError.value = errorMessage(error);
    return false;
  }

  return { errors, formError, validate, showServerError, clear };
}
