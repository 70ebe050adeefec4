import { onMounted, onScopeDispose, ref, toValue, watch, type MaybeRefOrGetter, type Ref } from 'vue';
import { PASSWORD_MIN_LENGTH } from '@shared/schemas';
import type { PasswordStrength } from '@shared/passwords';

export interface UsePasswordStrengthOptions {
  /** The new password as it is typed. */
  password: MaybeRefOrGetter<string>;
  /** The person's own details the password must not lean on (e-mail, names), as the server passes them. */
  personalInputs: MaybeRefOrGetter<readonly string[]>;
  /** Quiet time after the last key before the verdict is worked out, in ms. */
  delayMs?: number;
}

export interface UsePasswordStrength {
  /** The verdict on the password as typed; null while it is shorter than the minimum or being worked out. */
  strength: Ref<PasswordStrength | null>;
  /** The verdict on `password` now (for submit); rejects when the rule could not be loaded. */
  check(password: string): Promise<PasswordStrength>;
}

// The rule's dictionaries are large: one download per page load, shared by every form that asks.
let rule: Promise<typeof import('@shared/passwords')> | undefined;
const loadRule = () =>
  (rule ??= import('@shared/passwords').catch((error: unknown) => {
    rule = undefined; // a later check tries again
    throw error;
  }));

/**
 * The live strength verdict of a new password: the server's own rule (shared/passwords) with the
 * same personal details, so what the form shows while typing is what the server answers. The rule
 * is fetched once the form is mounted, not before the page shows.
 */
export function usePasswordStrength(options: UsePasswordStrengthOptions): UsePasswordStrength {
  const strength = ref<PasswordStrength | null>(null);
  const delayMs = options.delayMs ?? 150;

  async function check(password: string): Promise<PasswordStrength> {
    const { passwordStrength } = await loadRule();
    return passwordStrength(password, toValue(options.personalInputs));
  }

  onMounted(() => void loadRule().catch(() => undefined));

  let timer: ReturnType<typeof setTimeout> | undefined;
  watch(
    () => [toValue(options.password), ...toValue(options.personalInputs)],
    () => {
      clearTimeout(timer);
      strength.value = null;
      const typed = toValue(options.password);
      if (typed.length < PASSWORD_MIN_LENGTH) return;
      timer = setTimeout(async () => {
        const verdict = await check(typed).catch(() => null);
        if (toValue(options.password) === typed) strength.value = verdict;
      }, delayMs);
    },
  );
  onScopeDispose(() => clearTimeout(timer));

  return { strength, check };
}
