// Seeding a replica from a primary that already holds data written without a binary log (a single
// `npm start` before the first `SERVERS=3 npm start`): scripts/lib/mariadb.ts dumps it with
// mariadb-dump --gtid into the new replica, which then replicates what follows.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mariadb from 'mariadb';
import { afterAll, describe, expect, it } from 'vitest';
import { ensureDatabase, replicaStatus, startMariaDb, startReplica, type MariaDbServer } from '../../scripts/lib/mariadb';
import { freePort } from '../../scripts/lib/ports';
import { waitFor } from '../support/replica';

const baseDir = mkdtempSync(join(tmpdir(), 'brimstock-seed-'));
const running: MariaDbServer[] = [];
afterAll(async () => {
  for (const s of running.reverse()) await s.stop();
  rmSync(baseDir, { recursive: true, force: true });
}, 30_000);

async function sql<T = Record<string, unknown>[]>(server: MariaDbServer, query: string, values?: unknown[]): Promise<T> {
  const conn = await mariadb.createConnection({ socketPath: server.socketPath, user: 'root' });
  try {
    return (await conn.query(query, values)) as T;
  } finally {
    await conn.end();
  }
}

describe('a replica of a primary that already has data', () => {
  it('restarts the primary with a binary log, seeds the replica from a GTID dump and replicates what follows', async () => {
    const port = await freePort();
    const alone = await startMariaDb({ baseDir, port });
    running.push(alone);
    await ensureDatabase(alone.socketPath, { name: 'seeded', user: 'seeder', password: 'seeder-pw' });
    await sql(alone, 'CREATE TABLE seeded.rounds (id INT PRIMARY KEY, levelMm INT NOT NULL) ENGINE=InnoDB');
    await sql(alone, 'INSERT INTO seeded.rounds VALUES (1, 640), (2, 910)');
    expect(Number((await sql<{ b: number }[]>(alone, 'SELECT @@log_bin AS b'))[0].b)).toBe(0);

    // The same folder asked to be a primary: the server left running without a binary log is restarted with one.
    const primary = await startMariaDb({ baseDir, port, replication: { serverId: 1 } });
    running.push(primary);
    const [settings] = await sql<{ b: bigint; id: bigint; f: string; s: bigint }[]>(primary, 'SELECT @@log_bin AS b, @@server_id AS id, @@binlog_format AS f, @@gtid_strict_mode AS s');
    expect({ ...settings, b: Number(settings.b), id: Number(settings.id), s: Number(settings.s) }).toEqual({ b: 1, id: 1, f: 'ROW', s: 1 });

    const replica = await startReplica(primary, { baseDir, port: await freePort() });
    running.push(replica);
    expect(await sql(replica, 'SELECT id, levelMm FROM seeded.rounds ORDER BY id')).toEqual([{ id: 1, levelMm: 640 }, { id: 2, levelMm: 910 }]);
    // The application's account came with the dump and may log in there, but not write.
    const app = await mariadb.createConnection({ host: '127.0.0.1', port: replica.port, user: 'seeder', password: 'seeder-pw', database: 'seeded' });
    try {
      await expect(app.query('INSERT INTO rounds VALUES (3, 100)')).rejects.toThrow(/read-only/);
    } finally {
      await app.end();
    }

    await sql(primary, 'INSERT INTO seeded.rounds VALUES (3, 480)');
    await waitFor(async () => (await sql<unknown[]>(replica, 'SELECT 1 FROM seeded.rounds WHERE id = 3')).length === 1, 5_000, 'the new row on the replica');
    const [{ pos }] = await sql<{ pos: string }[]>(primary, 'SELECT @@gtid_binlog_pos AS pos');
    expect(await replicaStatus(replica.socketPath)).toMatchObject({ ioRunning: 'Yes', sqlRunning: 'Yes', secondsBehind: 0, gtidSlavePos: pos });
  }, 90_000);
});
