import { pino, type DestinationStream, type Logger } from 'pino';
import type { Config } from './config';

export const createLogger = (config: Pick<Config, 'logLevel'>, destination?: DestinationStream) =>
  pino({ level: config.logLevel, redact: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'] }, destination);

const REDACTED = '[redacted]';

/** A request URL with single-use link tokens blanked: the /tokens/<token> path segment and any token= query value. */
export function redactUrl(url: string): string {
  const q = url.indexOf('?');
  const path = (q < 0 ? url : url.slice(0, q)).replace(/(\/tokens\/)[^/]+/g, `$1${REDACTED}`);
  const query = q < 0 ? '' : url.slice(q).replace(/([?&]token=)[^&#]*/gi, `$1${REDACTED}`);
  return path + query;
}

type LoggedRequest = { method: string; url: string; headers: Record<string, unknown> };
type LoggedResponse = { statusCode: number; headers: Record<string, unknown> };

/**
 * pino-http serialisers: at info a request is its method and URL (tokens redacted) and a response
 * its status (pino-http adds the response time); headers are written only at debug, with cookies
 * and the CSRF token redacted by the logger.
 */
export function requestLogSerializers(logger: Logger) {
  const withHeaders = () => logger.isLevelEnabled('debug');
  return {
    req: (req: LoggedRequest) => ({ method: req.method, url: redactUrl(req.url), ...(withHeaders() ? { headers: req.headers } : {}) }),
    res: (res: LoggedResponse) => ({ statusCode: res.statusCode, ...(withHeaders() ? { headers: res.headers } : {}) }),
  };
}
