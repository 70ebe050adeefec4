// The stock board: totals of water, fertilizer, pest solution and culture from each tank's
// latest reading (tank_latest), across the farms a user may see and per farm.
import { createHash } from 'node:crypto';
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';
import { QueryTypes } from 'sequelize';
import { capacityL, heightMm, type TankGeometry } from '@shared/calibration';
import { totalsOf } from '@shared/board';
import { daysOfCoverSince } from '@shared/forecast';
import { stockFigures, usableCapacityL } from '@shared/readings';
import { datesEndingOn, farmDayOf } from '@shared/time';
import { TANK_CONTENTS, type BoardHistory, type BoardHistoryFarm, type BoardSnapshot, type FarmBoard, type SessionUser, type StockBoard, type TankContents, type TankTile } from '@shared/schemas';
import { clusterOf } from '../cluster';
import type { AppContext } from '../context';
import { farmSetKey, streamPosition } from './board-sequences';
import { queueForecastRefresh } from './forecasts';

const gzipAsync = promisify(gzip);

interface Row {
  tankId: number;
  farmId: number;
  farmName: string;
  name: string;
  code: string;
  contents: TankContents;
  geometry: TankGeometry | string;
  datumOffsetMm: number;
  outletHeightMm: number;
  safeFillLevelMm: number;
  lowStockL: number;
  levelMm: number | null;
  grossL: number | null;
  usableL: number | null;
  temperatureC: number | null;
  takenAt: Date | null;
  useLPerDay: number | null;
  forecastAt: Date | null;
}

// Sizes by geometry (as stored) and outlet and fill line: the closed forms cost tens of microseconds
// a tank, and a board of a thousand tanks is read on every request and every push.
interface Sizes {
  capacityL: number;
  usableCapacityL: number;
  heightMm: number;
}
const sizes = new Map<string, Sizes>();
function sizesOf(r: Pick<Row, 'geometry' | 'outletHeightMm' | 'safeFillLevelMm'>): Sizes {
  const stored = typeof r.geometry === 'string' ? r.geometry : JSON.stringify(r.geometry);
  const key = `${r.outletHeightMm}|${r.safeFillLevelMm}|${stored}`;
  let kept = sizes.get(key);
  if (kept === undefined) {
    const g = typeof r.geometry === 'string' ? (JSON.parse(r.geometry) as TankGeometry) : r.geometry;
    kept = { capacityL: capacityL(g), usableCapacityL: usableCapacityL(g, r), heightMm: heightMm(g) };
    if (sizes.size >= 10_000) sizes.clear();
    sizes.set(key, kept);
  }
  return kept;
}

/**
 * The tiles' rows in board order (farm name, walk order, tank name). The order comes from a narrow
 * query of ids: sorting the wide rows, which carry the geometry JSON (a text column), across two
 * tables makes MariaDB build its temporary table on disk, which cost more than the rest of the board.
 */
async function boardRows(ctx: AppContext, organisationId: number, farmIds: number[]): Promise<Row[]> {
  const where = 't.organisationId = ? AND t.farmId IN (?) AND t.archivedAt IS NULL AND f.archivedAt IS NULL';
  const replacements = [organisationId, farmIds];
  const [order, rows] = await Promise.all([
    ctx.db.sequelize.query<{ id: number }>(`SELECT t.id FROM tanks t JOIN farms f ON f.id = t.farmId WHERE ${where} ORDER BY f.name, t.walkOrder, t.name`, { replacements, type: QueryTypes.SELECT }),
    ctx.db.sequelize.query<Row>(
      `SELECT t.id AS tankId, t.farmId, f.name AS farmName, t.name, t.code, t.contents, t.geometry, t.datumOffsetMm, t.outletHeightMm, t.safeFillLevelMm, t.lowStockL,
              l.levelMm, l.grossL, l.usableL, l.temperatureC, l.takenAt, l.useLPerDay, l.forecastAt
         FROM tanks t JOIN farms f ON f.id = t.farmId
         LEFT JOIN tank_latest l ON l.tankId = t.id
        WHERE ${where}`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  const position = new Map(order.map((r, i) => [r.id, i]));
  // A tank added between the two reads goes last.
  return rows.sort((a, b) => (position.get(a.tankId) ?? order.length) - (position.get(b.tankId) ?? order.length));
}

/** The board for the farms the actor may see, with the position of their delta stream it includes. */
export async function stockBoard(ctx: AppContext, actor: SessionUser): Promise<StockBoard> {
  // Taken before the read: every delta numbered up to here was read before this board.
  const stream = await streamPosition(ctx, farmSetKey(actor.organisationId, actor.farmIds));
  return { ...(await boardOf(ctx, actor.organisationId, actor.farmIds)), stream };
}

/** The figures of some farms of one organisation (callers check access). */
export async function boardOf(ctx: AppContext, organisationId: number, farmIds: number[]): Promise<BoardSnapshot> {
  const rows = farmIds.length ? await boardRows(ctx, organisationId, farmIds) : [];
  const farms = new Map<number, FarmBoard>();
  const all: TankTile[] = [];
  const now = Date.now();
  for (const r of rows) {
    const size = sizesOf(r);
    const figures = r.grossL === null || r.usableL === null ? null : stockFigures({ grossL: r.grossL, usableL: r.usableL }, size.usableCapacityL);
    const takenAt = r.takenAt ? new Date(r.takenAt) : null;
    const tile: TankTile = {
      tankId: r.tankId,
      farmId: r.farmId,
      name: r.name,
      code: r.code,
      contents: r.contents,
      capacityL: size.capacityL,
      usableCapacityL: size.usableCapacityL,
      lowStockL: r.lowStockL,
      grossL: r.grossL,
      usableL: r.usableL,
      percentOfUsableCapacity: figures?.percentOfUsableCapacity ?? null,
      levelMm: r.levelMm,
      heightMm: size.heightMm,
      datumOffsetMm: r.datumOffsetMm,
      outletHeightMm: r.outletHeightMm,
      safeFillLevelMm: r.safeFillLevelMm,
      temperatureC: r.temperatureC,
      takenAt: takenAt ? takenAt.toISOString() : null,
      low: r.usableL !== null && r.usableL < r.lowStockL,
      useLPerDay: r.useLPerDay,
      // Counted from the reading, not from now: a tank read days ago has been drawn on since.
      daysOfCover: r.useLPerDay !== null && r.useLPerDay > 0 && r.usableL !== null && takenAt ? daysOfCoverSince(r.usableL, r.useLPerDay, takenAt.getTime(), now) : null,
    };
    all.push(tile);
    if (!farms.has(r.farmId)) farms.set(r.farmId, { farmId: r.farmId, name: r.farmName, totals: [], tanks: [] });
    farms.get(r.farmId)!.tanks.push(tile);
  }
  for (const f of farms.values()) f.totals = totalsOf(f.tanks);
  // A rate older than the tank's latest reading is recomputed in the background (it reads up to
  // 16 days of readings per tank); the board answers now with the rate cached so far.
  const stale = rows.filter((r) => r.takenAt && (!r.forecastAt || new Date(r.forecastAt) < new Date(r.takenAt))).map((r) => r.tankId);
  if (stale.length) void queueForecastRefresh(ctx, stale);
  return { generatedAt: new Date().toISOString(), totals: totalsOf(all), farms: [...farms.values()] };
}

/**
 * The board as JSON, kept per organisation and farm set while nothing it shows has changed. A
 * generation moves on after every write request and every in-process event that changes latest
 * readings or use rates (imports commit after their request, use rates are refreshed in the
 * background); a cheap fingerprint query (counts and maxima over tanks, farms and
 * tank_latest) also catches writes from outside this process, at most `FINGERPRINT_MS` late. Days
 * of cover count down with the clock, so a copy is rebuilt after `BOARD_CACHE_MS` anyway.
 */
const BOARD_CACHE_MS = 30_000;
const FINGERPRINT_MS = 1_000;
const BOARD_EVENTS = ['readings', 'forecasts'];

export interface KeptBoard {
  json: Buffer;
  etag: string;
  /** The same bytes gzipped, made on first ask. */
  gzip?: Promise<Buffer>;
}
interface BoardEntry extends KeptBoard {
  fingerprint: string;
  generation: number;
  builtAt: number;
  checkedAt: number;
}
interface BoardKeep {
  generation: number;
  entries: Map<string, BoardEntry>;
  /** Checks and rebuilds under way, per key. */
  flights: Map<string, { generation: number; board: Promise<BoardEntry> }>;
  /** A bus message saying the boards moved on is about to go. */
  telling: boolean;
}
const keeps = new WeakMap<AppContext, BoardKeep>();

function keepOf(ctx: AppContext): BoardKeep {
  const kept = keeps.get(ctx);
  if (kept) return kept;
  const keep: BoardKeep = { generation: 0, entries: new Map(), flights: new Map(), telling: false };
  for (const event of BOARD_EVENTS) ctx.events.on(event, () => invalidateBoards(ctx));
  // Another server process's write or event: its kept boards moved on, so do ours.
  clusterOf(ctx).bus.subscribe(BOARD_TOPIC, () => void keep.generation++);
  keeps.set(ctx, keep);
  return keep;
}

const BOARD_TOPIC = 'boards-changed';

/** Marks every kept board out of date, on this server process and (through the bus) on the others; called after any write request. */
export function invalidateBoards(ctx: AppContext): void {
  const keep = keepOf(ctx);
  keep.generation++;
  // Writes that finish together are told once.
  if (keep.telling) return;
  keep.telling = true;
  queueMicrotask(() => {
    keep.telling = false;
    clusterOf(ctx).bus.publish(BOARD_TOPIC, null);
  });
}

async function boardFingerprint(ctx: AppContext, organisationId: number, farmIds: number[]): Promise<string> {
  const [row] = await ctx.db.sequelize.query<{ t: string; f: string; l: string }>(
    `SELECT
       (SELECT CONCAT(COUNT(*), '/', COALESCE(MAX(updatedAt), '')) FROM tanks WHERE organisationId = :org AND farmId IN (:farms)) AS t,
       (SELECT CONCAT(COUNT(*), '/', COALESCE(MAX(updatedAt), '')) FROM farms WHERE organisationId = :org AND id IN (:farms)) AS f,
       (SELECT CONCAT(COUNT(*), '/', COALESCE(SUM(readingId), 0), '/', COALESCE(MAX(takenAt), ''), '/', COALESCE(MAX(forecastAt), ''), '/',
               COALESCE(SUM(grossL), 0), '/', COALESCE(SUM(temperatureC), 0), '/', COALESCE(SUM(useLPerDay), 0))
          FROM tank_latest WHERE organisationId = :org AND farmId IN (:farms)) AS l`,
    { replacements: { org: organisationId, farms: farmIds }, type: QueryTypes.SELECT },
  );
  return `${row.t}|${row.f}|${row.l}`;
}

/**
 * The actor's board as JSON bytes with an entity tag, from the kept copy when it is still right.
 * Requests that find the copy out of date at the same moment share one check and one rebuild.
 */
export async function stockBoardJson(ctx: AppContext, actor: SessionUser): Promise<KeptBoard> {
  if (!actor.farmIds.length) {
    const empty = await stockBoard(ctx, actor);
    return { json: Buffer.from(JSON.stringify(empty)), etag: `"board-empty-${empty.stream.epoch}"` };
  }
  const keep = keepOf(ctx);
  const farmIds = [...actor.farmIds].sort((a, b) => a - b);
  const key = farmSetKey(actor.organisationId, farmIds);
  const generation = keep.generation;
  const flight = keep.flights.get(key);
  if (flight && flight.generation === generation) return flight.board;
  const kept = keep.entries.get(key);
  const now = Date.now();
  const current = kept && kept.generation === generation && now - kept.builtAt < BOARD_CACHE_MS ? kept : undefined;
  if (current && now - current.checkedAt < FINGERPRINT_MS) return current;
  const board = refreshBoard(ctx, keep, key, actor.organisationId, farmIds, generation, current).finally(() => {
    if (keep.flights.get(key)?.board === board) keep.flights.delete(key);
  });
  keep.flights.set(key, { generation, board });
  return board;
}

async function refreshBoard(ctx: AppContext, keep: BoardKeep, key: string, organisationId: number, farmIds: number[], generation: number, current: BoardEntry | undefined): Promise<BoardEntry> {
  const fingerprint = await boardFingerprint(ctx, organisationId, farmIds);
  if (current && current.fingerprint === fingerprint) {
    current.checkedAt = Date.now();
    return current;
  }
  // The stream position is taken before the read, so the deltas numbered after it carry nothing older than this board.
  const stream = await streamPosition(ctx, key);
  const json = Buffer.from(JSON.stringify({ ...(await boardOf(ctx, organisationId, farmIds)), stream } satisfies StockBoard));
  const builtAt = Date.now();
  const entry: BoardEntry = { fingerprint, generation, builtAt, checkedAt: builtAt, json, etag: `"board-${createHash('sha1').update(json).digest('base64url')}"` };
  if (keep.entries.size >= 1_000) keep.entries.clear();
  keep.entries.set(key, entry);
  return entry;
}

/** The kept board's bytes gzipped (once per copy, off the main thread). */
export function gzippedBoard(board: KeptBoard): Promise<Buffer> {
  board.gzip ??= gzipAsync(board.json).catch((err: unknown) => {
    board.gzip = undefined;
    throw err;
  });
  return board.gzip;
}

/**
 * Usable litres per contents for each of the last `days` farm-local dates, carrying each tank's last
 * known value forward. A tank's day is its farm's local day (tank_days). The dates end at the latest
 * farm-local today among the farms shown (a farm east of the others reaches a date first); a farm that
 * has not reached that date yet counts its latest value there. Each farm's zone and today are listed.
 */
export async function boardHistory(ctx: AppContext, actor: SessionUser, days = 14, now = Date.now()): Promise<BoardHistory> {
  const farms = actor.farmIds.length
    ? (await ctx.db.models.Farm.findAll({ where: { organisationId: actor.organisationId, id: actor.farmIds, archivedAt: null }, attributes: ['id', 'name', 'timeZone'], order: [['name', 'ASC']] })).map(
        (f): BoardHistoryFarm => ({ farmId: f.id, name: f.name, timeZone: f.timeZone, today: farmDayOf(now, f.timeZone) }),
      )
    : [];
  const lastDate = farms.reduce((last, f) => (f.today > last ? f.today : last), farms.length ? farms[0].today : farmDayOf(now, 'UTC'));
  const dayList = datesEndingOn(lastDate, days);
  if (!farms.length) return { days: dayList, farms, series: TANK_CONTENTS.map((contents) => ({ contents, usableL: dayList.map(() => null) })) };
  const rows = await ctx.db.sequelize.query<{ tankId: number; day: string; usableL: number; contents: TankContents }>(
    `SELECT d.tankId, DATE_FORMAT(d.day, '%Y-%m-%d') AS day, d.usableL, t.contents
       FROM tank_days d JOIN tanks t ON t.id = d.tankId
      WHERE d.organisationId = ? AND d.farmId IN (?) AND t.archivedAt IS NULL
        AND (d.day >= ? OR d.day = (SELECT MAX(d2.day) FROM tank_days d2 WHERE d2.tankId = d.tankId AND d2.day < ?))
      ORDER BY d.day`,
    { replacements: [actor.organisationId, farms.map((f) => f.farmId), dayList[0], dayList[0]], type: QueryTypes.SELECT },
  );
  const last = new Map<number, { usableL: number; contents: TankContents }>();
  const series = TANK_CONTENTS.map((contents) => ({ contents, usableL: [] as (number | null)[] }));
  let i = 0;
  for (const day of dayList) {
    while (i < rows.length && rows[i].day <= day) {
      last.set(rows[i].tankId, { usableL: rows[i].usableL, contents: rows[i].contents });
      i++;
    }
    for (const s of series) {
      const vals = [...last.values()].filter((v) => v.contents === s.contents);
      s.usableL.push(vals.length ? vals.reduce((a, v) => a + v.usableL, 0) : null);
    }
  }
  return { days: dayList, farms, series };
}
