// The bulk insert path of logger imports (readingLoader): LOAD DATA LOCAL INFILE from memory in
// chunks, duplicates skipped and counted, all-or-nothing with its transaction, and the same latest
// reading and daily snapshots as the row-by-row path (insertReadings) gives for the same rows.
import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { localInfileStream } from '../../server/local-infile';
import { LOAD_CHUNK_ROWS, insertReadings, readingLoader, type LoadRow, type NewReading } from '../../server/services/readings';
import { useTestApp } from '../support/db';
import { makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const env = useTestApp();
// π/4 · (1 m)² per metre of level = 785.398 L/m (hand calculation for the 1,000 mm test cylinder).
const L_PER_MM = Math.PI / 4;
const ZONE = 'Europe/Dublin';

/** A level row at `iso`: litres of the 1,000 mm cylinder, outlet at 100 mm. */
const row = (iso: string, levelMm: number, temperatureC: number | null = 12.5): LoadRow => ({ takenAtMs: Date.parse(iso), levelMm, grossL: levelMm * L_PER_MM, usableL: (levelMm - 100) * L_PER_MM, temperatureC });

async function world() {
  const org = await makeOrganisation(env);
  const tank = await makeTank(env, org, org.farmIds[0], { code: 'BL' });
  const base = { organisationId: org.organisationId, farmId: org.farmIds[0], tankId: tank.id, calibrationVersion: tank.calibrationVersion, importId: 9_000 + tank.id };
  return { org, tank, base };
}

/** Loads `rows` through one loader in one transaction, with small chunks so several statements run. */
async function load(base: Awaited<ReturnType<typeof world>>['base'], rows: LoadRow[], chunkRows = 3) {
  return env.ctx.db.sequelize.transaction(async (tx) => {
    const loader = readingLoader(env.ctx, base, ZONE, tx, chunkRows);
    for (const r of rows) {
      const wait = loader.add(r);
      if (wait) await wait;
    }
    return loader.finish();
  });
}

const daysOf = (tankId: number) =>
  env.ctx.db.sequelize.query<{ day: string; takenAt: Date; grossL: number; usableL: number }>('SELECT day, takenAt, grossL, usableL FROM tank_days WHERE tankId = ? ORDER BY day', { replacements: [tankId], type: QueryTypes.SELECT });

describe('readingLoader', () => {
  it('stores every row with its values and counts them all new', async () => {
    const { tank, base } = await world();
    const rows = [row('2025-06-01T00:00:00Z', 1200), row('2025-06-01T01:00:00Z', 1190, null), row('2025-06-01T02:34:56.789Z', 1180.25), row('2025-06-01T03:00:00Z', 1170), row('2025-06-01T04:00:00Z', 1160)];
    const summary = await load(base, rows);
    expect(summary.rowsNew).toBe(5);
    const stored = await env.ctx.db.models.Reading.findAll({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] });
    expect(stored.map((r) => [r.takenAt.toISOString(), r.levelMm, r.temperatureC])).toEqual([
      ['2025-06-01T00:00:00.000Z', 1200, 12.5],
      ['2025-06-01T01:00:00.000Z', 1190, null],
      ['2025-06-01T02:34:56.789Z', 1180.25, 12.5],
      ['2025-06-01T03:00:00.000Z', 1170, 12.5],
      ['2025-06-01T04:00:00.000Z', 1160, 12.5],
    ]);
    // Doubles go through text and come back bit for bit.
    expect(stored[2].grossL).toBe(1180.25 * L_PER_MM);
    expect(stored[0]).toMatchObject({ source: 'logger', revision: 0, importId: base.importId, calibrationVersion: tank.calibrationVersion, note: '', enteredById: null, idempotencyKey: null, correctedById: null });
    const latest = await env.ctx.db.models.TankLatest.findByPk(tank.id);
    expect(latest).toMatchObject({ levelMm: 1160, source: 'logger', readingId: stored[4].id });
  });

  it('skips and does not count duplicates inside the file (across chunks) and against stored rows, keeping the stored values', async () => {
    const { tank, base } = await world();
    expect((await load(base, [row('2025-06-02T00:00:00Z', 1000), row('2025-06-02T01:00:00Z', 990)])).rowsNew).toBe(2);
    const second = [
      row('2025-06-02T01:00:00Z', 555), // stored already, with 990
      row('2025-06-02T02:00:00Z', 980),
      row('2025-06-02T03:00:00Z', 970),
      row('2025-06-02T04:00:00Z', 960),
      row('2025-06-02T02:00:00Z', 444), // earlier in this file, another chunk (chunks of 3)
      row('2025-06-02T04:00:00Z', 333), // the file's last instant twice
    ];
    const summary = await load(base, second);
    expect(summary.rowsNew).toBe(3);
    const stored = await env.ctx.db.models.Reading.findAll({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] });
    expect(stored.map((r) => r.levelMm)).toEqual([1000, 990, 980, 970, 960]);
    expect((await env.ctx.db.models.TankLatest.findByPk(tank.id))!.levelMm).toBe(960);
    const days = await daysOf(tank.id);
    expect(days).toHaveLength(1);
    expect(days[0].grossL).toBe(960 * L_PER_MM);
  });

  it('keeps the daily snapshot of the stored row when the file ends a day on a duplicate of it', async () => {
    const { tank, base } = await world();
    await load(base, [row('2025-06-03T20:00:00Z', 800)]);
    await load(base, [row('2025-06-03T10:00:00Z', 900), row('2025-06-03T20:00:00Z', 123)]);
    const [day] = await daysOf(tank.id);
    expect(new Date(day.takenAt).toISOString()).toBe('2025-06-03T20:00:00.000Z');
    expect(day.grossL).toBe(800 * L_PER_MM);
  });

  it('leaves nothing behind when its transaction rolls back after chunks were loaded', async () => {
    const { tank, base } = await world();
    await expect(
      env.ctx.db.sequelize.transaction(async (tx) => {
        const loader = readingLoader(env.ctx, base, ZONE, tx, 2);
        for (let i = 0; i < 7; i++) {
          const wait = loader.add(row(new Date(Date.UTC(2025, 5, 4, i)).toISOString(), 1000 - i));
          if (wait) await wait;
        }
        await loader.finish();
        throw new Error('refused after loading');
      }),
    ).rejects.toThrow('refused after loading');
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(0);
    expect(await env.ctx.db.models.TankLatest.findByPk(tank.id)).toBeNull();
    expect(await daysOf(tank.id)).toEqual([]);
  });

  it('gives the same latest reading and daily snapshots as insertReadings across local midnights and the end of summer time', async () => {
    const org = await makeOrganisation(env);
    const farmId = org.farmIds[0];
    const viaLoader = await makeTank(env, org, farmId, { code: 'L1' });
    const viaInsert = await makeTank(env, org, farmId, { code: 'I1' });
    // Every 17 minutes over four days around 26 Oct 2025, when Dublin goes from UTC+1 to UTC+0 at 01:00 UTC.
    const rows: LoadRow[] = [];
    for (let ms = Date.parse('2025-10-24T21:03:00Z'); ms < Date.parse('2025-10-28T02:00:00Z'); ms += 17 * 60_000) {
      const level = 1300 - ((ms / 60_000) % 900);
      rows.push({ takenAtMs: ms, levelMm: level, grossL: level * L_PER_MM, usableL: (level - 100) * L_PER_MM, temperatureC: null });
    }
    // Out of order, as a merged logger file may be.
    rows.reverse();
    const base = { organisationId: org.organisationId, farmId, tankId: viaLoader.id, calibrationVersion: viaLoader.calibrationVersion, importId: 77 };
    expect((await load(base, rows, 50)).rowsNew).toBe(rows.length);
    const asNew = (r: LoadRow): NewReading => ({
      organisationId: org.organisationId, farmId, tankId: viaInsert.id, takenAt: new Date(r.takenAtMs), source: 'logger', levelMm: r.levelMm, grossL: r.grossL, usableL: r.usableL,
      temperatureC: r.temperatureC, calibrationVersion: viaInsert.calibrationVersion, enteredById: null, importId: 78, note: '', idempotencyKey: null,
    });
    await env.ctx.db.sequelize.transaction(async (tx) => {
      for (let i = 0; i < rows.length; i += 40) await insertReadings(env.ctx, rows.slice(i, i + 40).map(asNew), new Map([[farmId, ZONE]]), tx);
    });
    const strip = (d: { day: string; takenAt: Date; grossL: number; usableL: number }) => ({ day: d.day, takenAt: new Date(d.takenAt).toISOString(), grossL: d.grossL, usableL: d.usableL });
    const loaderDays = (await daysOf(viaLoader.id)).map(strip);
    expect(loaderDays.map((d) => d.day)).toEqual(['2025-10-24', '2025-10-25', '2025-10-26', '2025-10-27', '2025-10-28']);
    expect(loaderDays).toEqual((await daysOf(viaInsert.id)).map(strip));
    const [a, b] = await Promise.all([env.ctx.db.models.TankLatest.findByPk(viaLoader.id), env.ctx.db.models.TankLatest.findByPk(viaInsert.id)]);
    expect({ ...a!.get(), tankId: 0, readingId: 0 }).toEqual({ ...b!.get(), tankId: 0, readingId: 0 });
  });
});

describe('LOAD DATA LOCAL INFILE', () => {
  it('sends only data offered from memory, never a file named in a statement', async () => {
    expect(() => localInfileStream('/etc/hostname')).toThrow(/not offered/);
    await env.ctx.db.sequelize.query('CREATE TABLE infile_probe (line TEXT)');
    await expect(env.ctx.db.sequelize.query("LOAD DATA LOCAL INFILE '/etc/hostname' INTO TABLE infile_probe", { type: QueryTypes.INSERT })).rejects.toThrow(/infileStreamFactory failed/);
    const [{ n }] = await env.ctx.db.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM infile_probe', { type: QueryTypes.SELECT });
    expect(Number(n)).toBe(0);
  });
});

describe('POST /api/imports over several load chunks', () => {
  it('keeps nothing of a long file whose last row is bad under reject-file, and every good row under valid-rows', async () => {
    const { org, tank } = await world();
    const worker = await signedIn(env, org.users.worker.email);
    const rows = LOAD_CHUNK_ROWS + 5;
    const start = Date.parse('2025-03-01T00:00:00Z');
    let csv = 'time,level_mm\n';
    for (let i = 0; i < rows - 1; i++) csv += `${new Date(start + i * 60_000).toISOString()},${1200 - (i % 700)}\n`;
    csv += `${new Date(start + rows * 60_000).toISOString()},n/a\n`;
    const mapping = JSON.stringify({ delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_mm', kind: 'level', unit: 'mm' } });
    const send = (policy: string) =>
      worker.post('/api/imports').set('x-csrf-token', worker.csrf).field('tankId', String(tank.id)).field('mapping', mapping).field('policy', policy).attach('files', Buffer.from(csv), { filename: 'long.csv', contentType: 'text/csv' }).expect(201);
    const refused = (await send('reject-file')).body.imports[0];
    expect(refused).toMatchObject({ status: 'rejected', rowsTotal: rows, rowsNew: 0, rowsRejected: 1 });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(0);
    expect(await env.ctx.db.models.TankLatest.findByPk(tank.id)).toBeNull();
    expect(await daysOf(tank.id)).toEqual([]);
    const kept = (await send('valid-rows')).body.imports[0];
    expect(kept).toMatchObject({ status: 'imported', rowsTotal: rows, rowsNew: rows - 1, rowsDuplicate: 0, rowsRejected: 1 });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(rows - 1);
    const last = rows - 2;
    expect((await env.ctx.db.models.TankLatest.findByPk(tank.id))!.levelMm).toBe(1200 - (last % 700));
  });
});
