// The tank screens' words in plain .ts: read when the text is needed (never at module load), so a
// change of language re-renders whatever shows them.
import { i18n } from '@/i18n';

/** The message `tank.<key>` in the current language. */
export function tankText(key: string, named?: Record<string, unknown>): string {
  return named ? i18n.global.t(`tank.${key}`, named) : i18n.global.t(`tank.${key}`);
}
