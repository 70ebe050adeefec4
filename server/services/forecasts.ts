// Tank forecasts: use rate, days of cover and suspected leaks from shared/forecast, over the
// tank's effective readings. The rate is cached in tank_latest so the board reads it cheaply.
import { col, Op } from 'sequelize';
import { tankForecast } from '@shared/forecast';
import type { SessionUser, TankForecastDto } from '@shared/schemas';
import { clusterOf } from '../cluster';
import type { AppContext } from '../context';
import type { Tank } from '../models';
import { tankFor } from './tanks';

const WINDOW_DAYS = 14;
/** How long a process's claim on refreshing one tank's rate after one reading holds (a refresh takes milliseconds). */
const CLAIM_MS = 60_000;
/** Quiet hours when no irrigation is planned: common practice, no published source; night draws are rare. */
export const QUIET_HOURS = { startHour: 23, endHour: 5 };

/** The tank's effective readings of the forecast window (plus two days), oldest first, as plain rows. */
async function seriesOf(ctx: AppContext, tankId: number, now: number): Promise<{ takenAt: number; volumeL: number }[]> {
  const rows = await ctx.db.models.Reading.findAll({
    where: { tankId, correctedById: null, takenAt: { [Op.gte]: new Date(now - (WINDOW_DAYS + 2) * 86_400_000) } },
    attributes: ['takenAt', 'grossL'],
    order: [['takenAt', 'ASC']],
    // Up to ~1,500 rows for a logger every 15 min: plain rows, no model instances.
    raw: true,
  });
  return rows.map((r) => ({ takenAt: new Date(r.takenAt).getTime(), volumeL: r.grossL }));
}

/**
 * Recomputes only the cached use rate (what the board shows): the same windowed daily use as
 * computeForecast, without its cover and leak passes.
 */
async function refreshRate(ctx: AppContext, tank: Tank, timeZone: string): Promise<void> {
  const latest = await ctx.db.models.TankLatest.findByPk(tank.id);
  if (!latest) return;
  const now = Date.now();
  const f = tankForecast(await seriesOf(ctx, tank.id, now), { geometry: tank.geometry, usableL: latest.usableL, levelMm: latest.levelMm, now, timeZone, windowDays: WINDOW_DAYS });
  await latest.update({ useLPerDay: f.meanLPerDay, useSdLPerDay: f.sdLPerDay, forecastAt: new Date(now) });
}

/** Computes a tank's forecast now (or at `now`, epoch ms) over the farm's local days in `timeZone` and caches its use rate beside the latest reading (unless `store` is false). */
export async function computeForecast(ctx: AppContext, tank: Tank, timeZone: string, opts: { store?: boolean; now?: number } = {}): Promise<TankForecastDto> {
  const { TankLatest } = ctx.db.models;
  const now = opts.now ?? Date.now();
  const latest = await TankLatest.findByPk(tank.id);
  const series = await seriesOf(ctx, tank.id, now);
  // Cover runs from the latest reading: the use since then is taken off at the mean rate.
  const f0 = tankForecast(series, {
    geometry: tank.geometry, usableL: latest?.usableL ?? 0, levelMm: latest?.levelMm ?? 0, now: latest ? latest.takenAt.getTime() : now, timeZone, windowDays: WINDOW_DAYS,
  });
  const sinceDays = latest ? (now - latest.takenAt.getTime()) / 86_400_000 : 0;
  const usableNowL = Math.max(0, (latest?.usableL ?? 0) - f0.meanLPerDay * sinceDays);
  const f = tankForecast(series, {
    geometry: tank.geometry, usableL: usableNowL, levelMm: latest?.levelMm ?? 0, now, timeZone, windowDays: WINDOW_DAYS,
    quietHours: QUIET_HOURS, leakThresholdLPerHour: Math.max(1, tank.lowStockL / 100),
  });
  if (latest && opts.store !== false) await latest.update({ useLPerDay: f.meanLPerDay, useSdLPerDay: f.sdLPerDay, forecastAt: new Date(now) });
  return {
    ...f,
    tankId: tank.id,
    usableL: latest?.usableL ?? null,
    windowDays: WINDOW_DAYS,
    projectedEmptyAt: f.projectedEmptyAt === null ? null : new Date(f.projectedEmptyAt).toISOString(),
    leaks: f.leaks.map((l) => ({ from: new Date(l.from).toISOString(), to: new Date(l.to).toISOString(), lossL: l.lossL, rateLPerHour: l.rateLPerHour })),
  };
}

/** GET /api/tanks/:id/forecast. */
export async function forecastFor(ctx: AppContext, actor: SessionUser, tankId: number): Promise<TankForecastDto> {
  const tank = await tankFor(ctx, actor, tankId);
  const farm = (await ctx.db.models.Farm.findByPk(tank.farmId))!;
  return computeForecast(ctx, tank, farm.timeZone);
}

/**
 * Refreshes cached rates that are older than the tank's latest reading (at most `limit` tanks).
 * Only the stale tanks are read; of several server processes, the one that claims a tank's latest
 * reading refreshes it and the others leave it. Returns the farms whose tanks got a new rate.
 */
export async function refreshStaleForecasts(ctx: AppContext, tankIds: number[], limit = 50): Promise<{ organisationId: number; farmIds: number[] }[]> {
  if (!tankIds.length) return [];
  const { TankLatest, Tank, Farm } = ctx.db.models;
  const stale = await TankLatest.findAll({
    where: { tankId: tankIds, [Op.or]: [{ forecastAt: null }, { forecastAt: { [Op.lt]: col('takenAt') } }] },
    attributes: ['tankId', 'takenAt'],
    limit,
  });
  if (!stale.length) return [];
  const { locks } = clusterOf(ctx);
  const claimed: number[] = [];
  for (const s of stale) if (await locks.claim(`use-rate:${s.tankId}:${new Date(s.takenAt).getTime()}`, CLAIM_MS)) claimed.push(s.tankId);
  if (!claimed.length) return [];
  const tanks = await Tank.findAll({ where: { id: claimed } });
  const zones = new Map((await Farm.findAll({ where: { id: [...new Set(tanks.map((t) => t.farmId))] } })).map((f) => [f.id, f.timeZone]));
  const touched = new Map<number, Set<number>>();
  for (const t of tanks) {
    await refreshRate(ctx, t, zones.get(t.farmId) ?? 'UTC');
    if (!touched.has(t.organisationId)) touched.set(t.organisationId, new Set());
    touched.get(t.organisationId)!.add(t.farmId);
  }
  return [...touched].map(([organisationId, farms]) => ({ organisationId, farmIds: [...farms] }));
}

const refreshQueues = new WeakMap<AppContext, { pending: Set<number>; running: Promise<void> | null }>();

/**
 * Queues tanks whose cached rate is stale and refreshes them one batch at a time, off the request
 * path: the board answers with the rate cached so far, and a 'forecasts' event { organisationId,
 * farmIds } follows once newer rates are stored (the live board pushes those farms again).
 * Returns a promise that settles when the queue has drained.
 */
export function queueForecastRefresh(ctx: AppContext, tankIds: number[]): Promise<void> {
  let queue = refreshQueues.get(ctx);
  if (!queue) refreshQueues.set(ctx, (queue = { pending: new Set(), running: null }));
  for (const id of tankIds) queue.pending.add(id);
  if (!queue.running && queue.pending.size) {
    const q = queue;
    q.running = (async () => {
      while (q.pending.size) {
        const batch = [...q.pending].slice(0, 50);
        for (const id of batch) q.pending.delete(id);
        try {
          for (const farms of await refreshStaleForecasts(ctx, batch, batch.length)) ctx.events.emit('forecasts', farms);
        } catch (err) {
          ctx.logger.warn({ err }, 'forecast refresh failed');
        }
      }
    })().finally(() => {
      q.running = null;
    });
  }
  return queue.running ?? Promise.resolve();
}
