// readingLoader: a logger file's readings into MariaDB by LOAD DATA in chunks, then the snapshot tables.
import { QueryTypes, type Transaction } from 'sequelize';
import { farmDayReader } from '@shared/time';
import type { AppContext } from '../context';
import { offerLocalInfile, withdrawLocalInfile } from '../local-infile';
import { upsertDays, upsertLatest, type SnapshotRow } from './readings-insert';

/** What every reading of one logger file shares. */
export interface LoadBase {
  organisationId: number;
  farmId: number;
  tankId: number;
  calibrationVersion: string;
  importId: number;
}

/** One converted logger row: UTC instant (epoch ms), level in mm, volumes in L, temperature in °C or null. */
export interface LoadRow {
  takenAtMs: number;
  levelMm: number;
  grossL: number;
  usableL: number;
  temperatureC: number | null;
}

/** What a finished load did, and where its time went (ms). */
export interface LoadSummary {
  rowsNew: number;
  /** Time the reader stood waiting for the database to take the previous chunk. */
  waitMs: number;
  /** Time MariaDB spent on the LOAD DATA statements (overlaps the reading of the file). */
  loadMs: number;
  snapshotsMs: number;
}

/** Rows per LOAD DATA statement (about 1.5 MB of text); one chunk is loaded while the next is being read. */
export const LOAD_CHUNK_ROWS = 20_000;

const TWO_DIGITS = Array.from({ length: 60 }, (_, i) => String(i).padStart(2, '0'));
const THREE_DIGITS = Array.from({ length: 1000 }, (_, i) => String(i).padStart(3, '0'));

/**
 * A formatter of UTC instants as 'YYYY-MM-DD HH:MM:SS.mmm' for a DATETIME(3) column; the date part is
 * kept per day, so a row costs a few divisions instead of a Date and toISOString (about 10× less).
 */
function sqlInstants(): (ms: number) => string {
  let dayNumber = NaN;
  let dayText = '';
  return (instant) => {
    // A Date drops a fraction of a millisecond the same way (toward zero).
    const ms = Math.trunc(instant);
    const day = Math.floor(ms / 86_400_000);
    if (day !== dayNumber) {
      dayNumber = day;
      dayText = `${new Date(day * 86_400_000).toISOString().slice(0, 10)} `;
    }
    let rest = ms - day * 86_400_000;
    const h = Math.floor(rest / 3_600_000);
    rest -= h * 3_600_000;
    const m = Math.floor(rest / 60_000);
    rest -= m * 60_000;
    const s = Math.floor(rest / 1000);
    return `${dayText}${TWO_DIGITS[h]}:${TWO_DIGITS[m]}:${TWO_DIGITS[s]}.${THREE_DIGITS[rest - s * 1000]}`;
  };
}

/**
 * The bulk insert path of logger imports: the readings of one tank, in any number, streamed into
 * MariaDB with LOAD DATA LOCAL INFILE … IGNORE in chunks inside `transaction` (rows whose natural key
 * exists already, in the table or earlier in the same load, are skipped and not counted as new). While
 * one chunk is being loaded the caller goes on reading the next, so at most two chunks are held. After
 * the last chunk the tank's latest reading and the daily snapshots of the days touched are brought up to
 * date with the stored values, as insertReadings does. `add` returns a promise only when the caller has
 * to wait for the database; `finish` must be called once, after the last row.
 */
export function readingLoader(ctx: Pick<AppContext, 'db'>, base: LoadBase, timeZone: string, transaction: Transaction, chunkRows = LOAD_CHUNK_ROWS) {
  const dayOf = farmDayReader(timeZone);
  const sqlInstant = sqlInstants();
  const createdAt = new Date();
  // Rows are written straight into the chunk's bytes (ASCII only), so no row outlives its own add().
  const chunkBytes = chunkRows * 128;
  let buf = Buffer.allocUnsafe(chunkBytes + 512);
  let pos = 0;
  let rowsInChunk = 0;
  let inFlight: Promise<void> | null = null;
  let failure: unknown = null;
  let rowsNew = 0;
  let waitMs = 0;
  let loadMs = 0;
  let newestMs = -Infinity;
  const lastOfDay = new Map<string, number>();

  const send = (data: Buffer) => {
    const started = performance.now();
    const name = offerLocalInfile(data);
    inFlight = ctx.db.sequelize
      .query(
        `LOAD DATA LOCAL INFILE '${name}' IGNORE INTO TABLE readings CHARACTER SET utf8mb4
         FIELDS TERMINATED BY '\\t' ESCAPED BY '\\\\' LINES TERMINATED BY '\\n'
         (takenAt, levelMm, grossL, usableL, temperatureC)
         SET organisationId = ?, farmId = ?, tankId = ?, source = 'logger', revision = 0, calibrationVersion = ?,
             enteredById = NULL, importId = ?, note = '', idempotencyKey = NULL, correctedById = NULL, correctsId = NULL, createdAt = ?`,
        { replacements: [base.organisationId, base.farmId, base.tankId, base.calibrationVersion, base.importId, createdAt], type: QueryTypes.INSERT, transaction },
      )
      .then(
        ([, affected]) => {
          rowsNew += Number(affected);
          loadMs += performance.now() - started;
        },
        (err: unknown) => {
          withdrawLocalInfile(name);
          failure ??= err;
        },
      );
  };
  const settle = async () => {
    if (inFlight) {
      const started = performance.now();
      await inFlight;
      waitMs += performance.now() - started;
      inFlight = null;
    }
    if (failure) throw failure;
  };
  const flush = async () => {
    const data = buf.subarray(0, pos);
    buf = Buffer.allocUnsafe(chunkBytes + 512);
    pos = 0;
    rowsInChunk = 0;
    await settle();
    send(data);
  };

  return {
    /** Queues one row; returns a promise to await when the previous chunk is still being loaded. */
    add(r: LoadRow): Promise<void> | undefined {
      if (failure) return Promise.reject(failure);
      // At most 23 + 4 × 24 + 5 bytes: well inside the 512 bytes kept free past chunkBytes.
      pos += buf.write(`${sqlInstant(r.takenAtMs)}\t${r.levelMm}\t${r.grossL}\t${r.usableL}\t${r.temperatureC === null ? '\\N' : r.temperatureC}\n`, pos, 'latin1');
      rowsInChunk++;
      if (r.takenAtMs > newestMs) newestMs = r.takenAtMs;
      const day = dayOf(r.takenAtMs);
      const last = lastOfDay.get(day);
      if (last === undefined || r.takenAtMs > last) lastOfDay.set(day, r.takenAtMs);
      return rowsInChunk >= chunkRows || pos >= chunkBytes ? flush() : undefined;
    },
    /** Loads what is left, then updates the latest reading and daily snapshots; returns the counts and timings. */
    async finish(): Promise<LoadSummary> {
      if (rowsInChunk) await flush();
      await settle();
      const started = performance.now();
      if (newestMs > -Infinity) await refreshLoadedSnapshots(ctx, base, newestMs, lastOfDay, transaction);
      return { rowsNew, waitMs, loadMs, snapshotsMs: performance.now() - started };
    },
  };
}

/**
 * Latest reading and daily snapshots after a load, from the rows as stored at the instants the file
 * ends each day (the stored row wins over a duplicate in the file, as it does in readings).
 */
async function refreshLoadedSnapshots(ctx: Pick<AppContext, 'db'>, base: LoadBase, newestMs: number, lastOfDay: Map<string, number>, transaction: Transaction) {
  type Stored = { id: number; takenAt: Date; levelMm: number; grossL: number; usableL: number; temperatureC: number | null };
  const storedAt = async (instants: number[]) =>
    ctx.db.sequelize.query<Stored>(
      `SELECT id, takenAt, levelMm, grossL, usableL, temperatureC FROM readings WHERE tankId = ? AND source = 'logger' AND revision = 0 AND takenAt IN (${instants.map(() => '?').join(',')})`,
      { replacements: [base.tankId, ...instants.map((ms) => new Date(ms))], type: QueryTypes.SELECT, transaction },
    );
  const own = { tankId: base.tankId, organisationId: base.organisationId, farmId: base.farmId };
  const [newest] = await storedAt([newestMs]);
  if (newest) await upsertLatest(ctx, [{ ...own, ...newest, takenAt: new Date(newest.takenAt), source: 'logger' }], transaction);
  const days = [...lastOfDay.entries()];
  for (let i = 0; i < days.length; i += 500) {
    const chunk = days.slice(i, i + 500);
    const byMs = new Map((await storedAt(chunk.map(([, ms]) => ms))).map((s) => [new Date(s.takenAt).getTime(), s]));
    const rows: SnapshotRow[] = [];
    for (const [day, ms] of chunk) {
      const s = byMs.get(ms);
      if (s) rows.push({ ...own, day, takenAt: new Date(ms), grossL: s.grossL, usableL: s.usableL });
    }
    await upsertDays(ctx, rows, transaction);
  }
}
