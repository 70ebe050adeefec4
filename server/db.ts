// The database handle: one Sequelize instance over the mariadb connector, its models, and
// umzug migrations from server/migrations (numbered files, run in order).
import { Sequelize, type QueryInterface, type ReplicationOptions } from 'sequelize';
import { Umzug, SequelizeStorage } from 'umzug';
import type { Config } from './config';
import { attachReplicaReads, type ReplicaLog, type ReplicaReads } from './db-replicas';
import { localInfileStream } from './local-infile';
import { initModels, type Models } from './models';
import * as m0001 from './migrations/0001-foundation';
import * as m0002 from './migrations/0002-tanks';
import * as m0003 from './migrations/0003-readings';
import * as m0004 from './migrations/0004-imports';
import * as m0005 from './migrations/0005-inventory';
import * as m0006 from './migrations/0006-forecasts';
import * as m0007 from './migrations/0007-flags';
import * as m0008 from './migrations/0008-brews';
import * as m0009 from './migrations/0009-flag-mail';
import * as m0010 from './migrations/0010-import-file-claim';
import * as m0011 from './migrations/0011-reading-key-per-person';
import * as m0012 from './migrations/0012-flag-clear-note';
import * as m0013 from './migrations/0013-email-per-organisation';
import * as m0014 from './migrations/0014-import-repeats-and-notices';
import * as m0015 from './migrations/0015-first-owner-setup';
import * as m0016 from './migrations/0016-order-numbers-currency-close-short';
import * as m0017 from './migrations/0017-frost-ahead';
import * as m0018 from './migrations/0018-text-messages';
import * as m0019 from './migrations/0019-user-language';

/** Migrations in order; add a new numbered file and list it here. */
const MIGRATIONS = [
  { name: '0001-foundation', module: m0001 },
  { name: '0002-tanks', module: m0002 },
  { name: '0003-readings', module: m0003 },
  { name: '0004-imports', module: m0004 },
  { name: '0005-inventory', module: m0005 },
  { name: '0006-forecasts', module: m0006 },
  { name: '0007-flags', module: m0007 },
  { name: '0008-brews', module: m0008 },
  { name: '0009-flag-mail', module: m0009 },
  { name: '0010-import-file-claim', module: m0010 },
  { name: '0011-reading-key-per-person', module: m0011 },
  { name: '0012-flag-clear-note', module: m0012 },
  { name: '0013-email-per-organisation', module: m0013 },
  { name: '0014-import-repeats-and-notices', module: m0014 },
  { name: '0015-first-owner-setup', module: m0015 },
  { name: '0016-order-numbers-currency-close-short', module: m0016 },
  { name: '0017-frost-ahead', module: m0017 },
  { name: '0018-text-messages', module: m0018 },
  { name: '0019-user-language', module: m0019 },
];

export interface Database {
  sequelize: Sequelize;
  models: Models;
  /** Reads on the replicas of DB_REPLICAS / DB_REPLICA_PORT (server/db-replicas.ts); null: none, everything reads the primary. */
  replicas: ReplicaReads | null;
}

const consoleLog: ReplicaLog = { warn: (_details, message) => console.warn(message), info: (_details, message) => console.log(message) };

/**
 * One Sequelize instance over the primary; with replicas configured, over Sequelize's `replication`
 * option (write: the primary, read: the replicas), closing the replica watch when it closes.
 */
export function createDatabase(config: Pick<Config, 'db'>, opts: { logging?: false | ((sql: string) => void); logger?: ReplicaLog } = {}): Database {
  const { db } = config;
  const connection = { connectTimeout: 5_000, permitLocalInfile: true, infileStreamFactory: localInfileStream };
  // Replicas are reached over TCP; the primary over its Unix socket when one is set.
  const replication = db.replicas.hosts.length
    ? { write: { host: db.host, port: db.port }, read: db.replicas.hosts.map((h) => ({ host: h.host, port: h.port, dialectOptions: { connectTimeout: 5_000 } })) }
    : undefined;
  const sequelize = new Sequelize(db.name, db.user, db.password, {
    host: db.host,
    port: db.port,
    dialect: 'mariadb',
    logging: opts.logging ?? false,
    pool: { max: db.poolMax, min: 0, acquire: 20_000, idle: 10_000 },
    // LOAD DATA LOCAL INFILE streams logger rows from memory only (server/local-infile.ts), never a file by path.
    dialectOptions: { ...connection, ...(db.socketPath ? { socketPath: db.socketPath } : {}) },
    timezone: '+00:00',
    ...(replication ? { replication: replication as ReplicationOptions } : {}),
  });
  const replicas = replication ? attachReplicaReads(sequelize, db, opts.logger ?? consoleLog) : null;
  if (replicas) {
    const close = sequelize.close.bind(sequelize);
    sequelize.close = async () => {
      await replicas.stop();
      return close();
    };
  }
  return { sequelize, models: initModels(sequelize), replicas };
}

export function migrator(sequelize: Sequelize) {
  return new Umzug<QueryInterface>({
    migrations: MIGRATIONS.map(({ name, module }) => ({
      name,
      up: ({ context }: { context: QueryInterface }) => module.up({ context }),
      down: ({ context }: { context: QueryInterface }) => module.down({ context }),
    })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

/** Applies every pending migration; returns their names. */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const done = await migrator(sequelize).up();
  return done.map((m) => m.name);
}
