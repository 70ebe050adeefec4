// When a failed request means "no way to the server" (airplane mode, the server stopped, a proxy with
// nothing behind it) rather than an answer: the app then works from the device's copies.
import { isApiError } from '@/api/http';

/** True for no connection at all, or a gateway's own 502/503/504 page (not an answer of the app's server). */
export function isUnreachable(error: unknown): boolean {
  if (!isApiError(error)) return false;
  return error.status === 0 || ([502, 503, 504].includes(error.status) && error.code === 'http_error');
}
