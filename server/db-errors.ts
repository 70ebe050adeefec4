// Which errors mean "the database cannot be reached right now" (answered 503 with Retry-After)
// rather than a fault in the request or the code (answered 500).

/** Sequelize's own names for failing to get or keep a connection. */
const CONNECTION_ERROR_NAMES = new Set([
  'SequelizeConnectionError',
  'SequelizeConnectionRefusedError',
  'SequelizeConnectionAcquireTimeoutError',
  'SequelizeConnectionTimedOutError',
  'SequelizeHostNotFoundError',
  'SequelizeHostNotReachableError',
  'SequelizeAccessDeniedError',
]);

/** Socket and server codes of a lost or refused connection (Node's socket errors, the mariadb connector's, MariaDB's own). */
const CONNECTION_CODES = new Set([
  'ECONNRESET',
  'ECONNREFUSED',
  'ETIMEDOUT',
  'EPIPE',
  'ENOTCONN',
  'EHOSTUNREACH',
  'ER_SOCKET_UNEXPECTED_CLOSE',
  'ER_CONNECTION_ALREADY_CLOSED',
  'ER_CMD_CONNECTION_CLOSED',
  'ER_GET_CONNECTION_TIMEOUT',
  'ER_POOL_ALREADY_CLOSED',
  'ER_SOCKET_TIMEOUT',
  'ER_CONNECTION_TIMEOUT',
  'ER_SERVER_SHUTDOWN',
  'ER_CON_COUNT_ERROR',
  'ER_CONNECTION_KILLED',
]);

interface MaybeDbError {
  name?: unknown;
  code?: unknown;
  fatal?: unknown;
  parent?: MaybeDbError;
  original?: MaybeDbError;
  cause?: MaybeDbError;
}

/** True when `err` (or what it wraps) says the database is unreachable or the connection was lost. */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 4) return false;
  const e = err as MaybeDbError;
  if (typeof e.name === 'string' && CONNECTION_ERROR_NAMES.has(e.name)) return true;
  if (typeof e.code === 'string' && CONNECTION_CODES.has(e.code)) return true;
  // The mariadb connector marks errors after which the connection is unusable as fatal.
  if (e.fatal === true && typeof e.code === 'string') return true;
  return [e.parent, e.original, e.cause].some((inner) => inner !== err && isDatabaseUnavailable(inner, depth + 1));
}

/** Seconds a client is asked to wait before trying again when the database is down. */
export const DATABASE_RETRY_AFTER_S = 5;
