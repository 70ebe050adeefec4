// Reads on MariaDB read replicas, behind Sequelize's `replication` option (write: the primary, read:
// the replicas). Everything reads the primary unless it runs inside `readFromReplica` (the board and
// history routes, through middleware/replica-reads.ts). There a SELECT outside a transaction goes to a
// replica that the watch below finds replicating within its lag bound, and only once that replica has
// reached the primary's GTID position as of the request's first read (MASTER_GTID_WAIT, bounded): so a
// reading committed before the request started is always seen, by the worker who sent it and by
// everyone else. A scope reads the primary from its first write on (work it starts, such as a use-rate
// refresh and the pushes after it, must see that write) and after `done()`. A replica that is stopped,
// lagging, too slow to catch up or failing a query leaves its reads to the primary; the watch puts it
// back when it replicates again.
import { AsyncLocalStorage } from 'node:async_hooks';
import mariadb, { type Connection } from 'mariadb';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Config } from './config';
import { isDatabaseUnavailable } from './db-errors';

/** Where the watch reports a replica going out of use or coming back (a pino logger fits). */
export interface ReplicaLog {
  warn(details: object, message: string): void;
  info(details: object, message: string): void;
}

interface Scope {
  replica: boolean;
  /** The primary's GTID position when this scope first read (null: it could not be read). */
  primaryPos?: Promise<string | null>;
}
const scopes = new AsyncLocalStorage<Scope>();

/**
 * Runs `fn` with its reads (SELECTs outside a transaction) on a replica once it has caught up with the
 * primary, until the scope writes or `fn` calls `done`; without a usable replica they read the primary,
 * as everything outside such a scope does.
 */
export function readFromReplica<T>(fn: (done: () => void) => T): T {
  const scope: Scope = { replica: true };
  return scopes.run(scope, () => fn(() => void (scope.replica = false)));
}

/** One replica as the watch last saw it. */
export interface ReplicaState {
  /** host:port */
  key: string;
  usable: boolean;
  /** Why it is out of use (empty while usable). */
  reason: string;
  secondsBehind: number | null;
  /** When it last changed between usable and not (ms since the epoch; null: not checked yet). */
  changedAt: number | null;
}

export interface ReplicaReads {
  /** Each replica's state as last checked. */
  states(): ReplicaState[];
  /** Reads so far: served by a replica; sent to the primary from a replica scope (none usable, not caught up, or failed); waits that timed out. */
  readonly counts: { replica: number; fallback: number; waitTimeouts: number; failures: number };
  /** Checks every replica now (also done every `checkMs`). */
  check(): Promise<void>;
  /** Stops the watch and closes its connections. */
  stop(): Promise<void>;
}

interface ReadConnection {
  queryType?: 'read' | 'write';
  replicaKey?: string;
  /** The last primary position this connection's server was seen to have reached. */
  reachedPos?: string;
  query(sql: string, values?: unknown[]): Promise<unknown>;
}
interface QueryOptionsLike {
  type?: string;
  useMaster?: boolean;
  transaction?: unknown;
  [key: string]: unknown;
}
type AnyQuery = (sql: unknown, options?: QueryOptionsLike) => Promise<unknown>;
type Watched = ReplicaState & {
  host: string;
  port: number;
  conn?: Connection;
  checking?: Promise<void>;
  /** A wait for the primary's position timed out: back in use only at 0 s behind, so one lag does not slow every request. */
  slow?: boolean;
};

const keyOf = (host: string | undefined, port: number | string | undefined) => `${host}:${port}`;
const errorText = (err: unknown) => {
  const e = err as { code?: unknown; message?: unknown };
  return typeof e?.code === 'string' ? e.code : typeof e?.message === 'string' ? e.message : String(err);
};

/** Routes the reads of `readFromReplica` scopes to the replicas of `sequelize` and starts watching them. */
export function attachReplicaReads(sequelize: Sequelize, db: Config['db'], log: ReplicaLog): ReplicaReads {
  const settings = db.replicas;
  const watched: Watched[] = settings.hosts.map((h) => ({ ...h, key: keyOf(h.host, h.port), usable: false, reason: 'not checked yet', secondsBehind: null, changedAt: null }));
  const byKey = new Map(watched.map((w) => [w.key, w]));
  const counts = { replica: 0, fallback: 0, waitTimeouts: 0, failures: 0 };
  const anyUsable = () => watched.some((w) => w.usable);

  const setState = (w: Watched, usable: boolean, reason: string, secondsBehind: number | null) => {
    const first = w.changedAt === null;
    const changed = w.usable !== usable || first;
    Object.assign(w, { usable, reason, secondsBehind });
    if (!changed) return;
    w.changedAt = Date.now();
    if (usable && first) log.info({ replica: w.key, secondsBehind }, `MariaDB replica ${w.key} is replicating: board and history reads go to it`);
    else if (usable) log.warn({ replica: w.key, secondsBehind }, `MariaDB replica ${w.key} is replicating again: board and history reads go to it`);
    else log.warn({ replica: w.key, reason }, `MariaDB replica ${w.key} is out of use (${reason}): its reads go to the primary`);
  };

  const checkOne = async (w: Watched) => {
    // Generous against a busy machine: a check that fails for want of time takes a usable replica out of use.
    const timeoutMs = Math.max(3_000, settings.checkMs * 2);
    let timer: NodeJS.Timeout | undefined;
    try {
      const work = (async () => {
        w.conn ??= await mariadb.createConnection({ host: w.host, port: w.port, user: db.user, password: db.password, connectTimeout: Math.min(timeoutMs, 5_000) });
        return (await w.conn.query('SHOW SLAVE STATUS')) as Record<string, unknown>[];
      })();
      // Past the time limit its late failure is of no interest (the catch below has already judged it).
      work.catch(() => undefined);
      const rows = await Promise.race([work, new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error(`no answer in ${timeoutMs} ms`)), timeoutMs)))]);
      const row = rows[0];
      if (!row) return setState(w, false, 'it has no primary to replicate from', null);
      const io = String(row.Slave_IO_Running);
      const sql = String(row.Slave_SQL_Running);
      const behind = row.Seconds_Behind_Master === null || row.Seconds_Behind_Master === undefined ? null : Number(row.Seconds_Behind_Master);
      if (io !== 'Yes' || sql !== 'Yes' || behind === null) {
        const error = String(row.Last_IO_Error || row.Last_SQL_Error || '');
        return setState(w, false, `replication stopped: IO thread ${io}, SQL thread ${sql}${error ? `, ${error}` : ''}`, null);
      }
      if (behind > settings.maxLagS) return setState(w, false, `${behind} s behind the primary, over the bound of ${settings.maxLagS} s`, behind);
      if (w.slow && behind > 0) return setState(w, false, w.reason, behind);
      w.slow = false;
      setState(w, true, '', behind);
    } catch (err) {
      w.conn?.destroy();
      w.conn = undefined;
      const code = (err as { errno?: number }).errno;
      // 1227: the account lacks the privilege to read the replication state.
      setState(w, false, code === 1227 ? `the account ${db.user} may not read SHOW SLAVE STATUS (GRANT SLAVE MONITOR ON *.* to it)` : `cannot be reached: ${errorText(err)}`, null);
    } finally {
      clearTimeout(timer);
    }
  };
  const check = () =>
    Promise.all(
      watched.map((w) => {
        w.checking ??= checkOne(w).finally(() => (w.checking = undefined));
        return w.checking;
      }),
    ).then(() => undefined);

  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  const tick = () => {
    void check().finally(() => {
      if (stopped) return;
      timer = setTimeout(tick, settings.checkMs);
      timer.unref();
    });
  };
  tick();

  // Which replica a read connection belongs to (the write connection's key is never looked up).
  sequelize.addHook('afterConnect', (connection, config) => {
    const c = config as { host?: string; port?: number | string };
    (connection as ReadConnection).replicaKey = keyOf(c.host, c.port);
  });

  const query = sequelize.query.bind(sequelize) as AnyQuery;
  const primaryPosition = async (): Promise<string | null> => {
    try {
      const row = (await query('SELECT @@gtid_binlog_pos AS pos', { type: QueryTypes.SELECT, plain: true, useMaster: true })) as { pos: string } | null;
      return row?.pos ?? null;
    } catch {
      return null;
    }
  };

  // A read connection is handed out only when its replica is usable and has reached the scope's primary position.
  const manager = sequelize.connectionManager as unknown as { getConnection(o: QueryOptionsLike): Promise<ReadConnection>; releaseConnection(c: ReadConnection): void };
  const acquire = manager.getConnection.bind(manager);
  const reached = async (conn: ReadConnection, pos: string | null | undefined): Promise<boolean> => {
    if (pos === null || pos === undefined) return false;
    if (conn.reachedPos === pos) return true;
    try {
      const [row] = (await conn.query('SELECT MASTER_GTID_WAIT(?, ?) AS r', [pos, settings.waitMs / 1000])) as { r: number | bigint | null }[];
      if (Number(row?.r) === 0) {
        conn.reachedPos = pos;
        return true;
      }
      counts.waitTimeouts++;
      const w = conn.replicaKey === undefined ? undefined : byKey.get(conn.replicaKey);
      if (w?.usable) {
        w.slow = true;
        setState(w, false, `it did not reach the primary's position within ${settings.waitMs} ms`, w.secondsBehind);
      }
      return false;
    } catch {
      counts.failures++;
      void check();
      return false;
    }
  };
  manager.getConnection = async (options: QueryOptionsLike) => {
    const conn = await acquire(options);
    if (conn.queryType !== 'read') return conn;
    const scope = scopes.getStore();
    const usable = conn.replicaKey !== undefined && byKey.get(conn.replicaKey)?.usable === true;
    // Only a read through `sequelize.query` has a position to wait for (a read-only transaction asks the pool directly).
    if (usable && scope?.replica && scope.primaryPos && (await reached(conn, await scope.primaryPos))) {
      counts.replica++;
      return conn;
    }
    manager.releaseConnection(conn);
    // This request has waited once: the rest of its reads go to the primary without waiting again.
    if (scope) scope.replica = false;
    counts.fallback++;
    return acquire({ ...options, useMaster: true });
  };

  sequelize.query = (async (sql: unknown, options: QueryOptionsLike = {}) => {
    const scope = scopes.getStore();
    // A write (or any statement of a transaction) ends the scope's replica reads: what follows must see it.
    if (scope?.replica && (options.type !== QueryTypes.SELECT || options.transaction)) scope.replica = false;
    const toReplica = scope?.replica === true && options.type === QueryTypes.SELECT && options.useMaster !== true && !options.transaction && anyUsable();
    if (!toReplica) {
      if (scope?.replica && options.type === QueryTypes.SELECT && options.useMaster !== true) counts.fallback++;
      return query(sql, { ...options, useMaster: true });
    }
    scope.primaryPos ??= primaryPosition();
    try {
      return await query(sql, { ...options, useMaster: false });
    } catch (err) {
      if (!isDatabaseUnavailable(err)) throw err;
      // A replica that went away mid-request: this read is answered by the primary, the watch looks again now.
      counts.failures++;
      counts.fallback++;
      scope.replica = false;
      void check();
      return query(sql, { ...options, useMaster: true });
    }
  }) as typeof sequelize.query;

  return {
    states: () => watched.map(({ key, usable, reason, secondsBehind, changedAt }) => ({ key, usable, reason, secondsBehind, changedAt })),
    counts,
    check,
    async stop() {
      stopped = true;
      clearTimeout(timer);
      await Promise.all(watched.map((w) => w.checking));
      await Promise.all(watched.map((w) => w.conn?.end().catch(() => w.conn?.destroy())));
    },
  };
}
