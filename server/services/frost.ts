// Frost ahead: every few hours (and once at start-up) each located farm's hourly air forecast is
// fetched (server/weather/client.ts); a low under the farm's threshold in the next 48 hours raises a
// frost-ahead flag on its exposed tanks and its cultures kept warm, and a later forecast without it
// clears them. A failed fetch (service down, too slow, nonsense) changes no flag: it is logged as a
// warning and kept on the farm's forecast row, and the farm page says the forecast is old.
import type { FlagCondition } from '@shared/flags';
import { FROST_AHEAD_HOURS, frostAheadMessage, frostAheadOf, watchedForFrost } from '@shared/flags';
import type { FarmFrost, ForecastHour, SessionUser } from '@shared/schemas';
import { startPeriodicJob } from '../cluster/periodic-job';
import type { AppContext } from '../context';
import type { Farm, Flag } from '../models';
import { ForecastUnavailable, fetchHourlyAirForecast } from '../weather/client';
import { assertFarmAccess } from './access';
import { mailRaisedFlags } from './flag-mail';
import { queueRaisedFlagTexts } from './flag-texts';
import { reconcile } from './flags';

const located = (f: Farm): f is Farm & { latitude: number; longitude: number } => f.latitude !== null && f.latitude !== undefined && f.longitude !== null && f.longitude !== undefined;
const withMs = (hours: readonly ForecastHour[]) => hours.map((h) => ({ atMs: Date.parse(h.at), airC: h.airC }));

/** Brings the frost-ahead flags of a farm's tanks in line with a forecast (null frost: none ahead); true when any changed. */
async function reconcileFrostFlags(ctx: AppContext, farm: Farm, frost: { atMs: number; lowC: number } | null): Promise<boolean> {
  const tanks = await ctx.db.models.Tank.findAll({ where: { farmId: farm.id, archivedAt: null } });
  const raised: Flag[] = [];
  let changed = false;
  for (const tank of tanks) {
    const holding: FlagCondition[] =
      frost && !farm.archivedAt && watchedForFrost(tank) ? [{ kind: 'frost-ahead', value: frost.lowC, message: frostAheadMessage(tank, frost, farm.frostAheadC, farm.timeZone) }] : [];
    if (await reconcile(ctx, { organisationId: farm.organisationId, farmId: farm.id, type: 'tank', id: tank.id }, ['frost-ahead'], holding, raised)) changed = true;
  }
  // A tank archived since keeps no frost flag.
  const archivedFlags = await ctx.db.models.Flag.findAll({ where: { farmId: farm.id, kind: 'frost-ahead', activeKey: 1, subjectType: 'tank' } });
  const live = new Set(tanks.map((t) => t.id));
  for (const f of archivedFlags.filter((f) => !live.has(f.subjectId))) {
    await f.update({ status: 'cleared', activeKey: null, clearedAt: new Date() });
    changed = true;
  }
  // Like every other flag: a mail and a text to those who chose one per flag.
  await mailRaisedFlags(ctx, farm.organisationId, raised);
  await queueRaisedFlagTexts(ctx, farm.organisationId, raised);
  return changed;
}

/**
 * Fetches one farm's forecast and brings its frost-ahead flags in line; a farm without a place (or
 * archived) has its flags cleared and nothing fetched. Returns whether flags changed and how the fetch went.
 */
export async function checkFarmFrost(ctx: AppContext, farm: Farm): Promise<{ changed: boolean; problem: string | null }> {
  if (!located(farm) || farm.archivedAt) return { changed: await reconcileFrostFlags(ctx, farm, null), problem: null };
  const { FarmForecast } = ctx.db.models;
  const now = new Date();
  let hours: ForecastHour[];
  try {
    hours = await fetchHourlyAirForecast({ baseUrl: ctx.config.weather.url, timeoutMs: ctx.config.weather.timeoutMs }, farm);
  } catch (err) {
    const problem = err instanceof ForecastUnavailable ? err.message : 'the forecast could not be read';
    ctx.logger.warn({ farmId: farm.id, reason: err instanceof ForecastUnavailable ? err.reason : 'error', err: err instanceof ForecastUnavailable ? undefined : err }, `frost forecast for farm ${farm.id} not updated: ${problem}; its flags stay as they were`);
    const kept = await FarmForecast.findByPk(farm.id);
    if (kept) await kept.update({ triedAt: now, problem });
    else await FarmForecast.create({ farmId: farm.id, latitude: farm.latitude, longitude: farm.longitude, hours: null, fetchedAt: null, triedAt: now, problem });
    return { changed: false, problem };
  }
  await FarmForecast.upsert({ farmId: farm.id, latitude: farm.latitude, longitude: farm.longitude, hours, fetchedAt: now, triedAt: now, problem: null });
  const frost = frostAheadOf(withMs(hours), farm.frostAheadC, now.getTime());
  return { changed: await reconcileFrostFlags(ctx, farm, frost), problem: null };
}

/** Checks every farm once, one after another; emits `flags` for the farms whose flags changed. Returns how many fetches failed. */
export async function checkAllFarmsFrost(ctx: AppContext): Promise<{ farms: number; failed: number }> {
  const farms = await ctx.db.models.Farm.findAll();
  let failed = 0;
  const changedByOrg = new Map<number, number[]>();
  for (const farm of farms) {
    const r = await checkFarmFrost(ctx, farm);
    if (r.problem) failed++;
    if (r.changed) changedByOrg.set(farm.organisationId, [...(changedByOrg.get(farm.organisationId) ?? []), farm.id]);
  }
  for (const [organisationId, farmIds] of changedByOrg) ctx.events.emit('flags', { organisationId, farmIds });
  return { farms: farms.length, failed };
}

/**
 * Runs the frost check once `firstMs` after start (null: not) and then every `everyMs` (default the
 * WEATHER_EVERY_MINUTES setting); a run still going when the next is due is not doubled. Of several
 * server processes one runs each period's check (server/cluster/periodic-job.ts). Returns a stop function.
 */
export function attachFrostWatch(ctx: AppContext, opts: { everyMs?: number; firstMs?: number | null } = {}): () => void {
  let running: Promise<void> | null = null;
  const run = () => {
    if (running) return running;
    running = checkAllFarmsFrost(ctx)
      .then(() => undefined)
      .finally(() => {
        running = null;
      });
    return running;
  };
  return startPeriodicJob(ctx, {
    name: 'frost-watch',
    periodMs: opts.everyMs ?? ctx.config.weather.everyMs,
    firstAfterMs: opts.firstMs === null ? undefined : (opts.firstMs ?? 500),
    work: run,
  });
}

/** The farm's stored forecast for the next 48 hours, its threshold and whether it is old (GET /api/farms/:id/frost). */
export async function farmFrostOf(ctx: AppContext, actor: SessionUser, farmId: number): Promise<FarmFrost> {
  const farm = await assertFarmAccess(ctx, actor, farmId);
  const row = await ctx.db.models.FarmForecast.findByPk(farm.id);
  const now = Date.now();
  // A forecast fetched for another place than the farm's present one says nothing of it.
  const samePlace = row !== null && row.latitude === farm.latitude && row.longitude === farm.longitude;
  const hours = samePlace && row.hours ? row.hours.filter((h) => Date.parse(h.at) >= now - 3_600_000 && Date.parse(h.at) <= now + FROST_AHEAD_HOURS * 3_600_000) : [];
  const frost = frostAheadOf(withMs(hours), farm.frostAheadC, now);
  const fetchedAt = samePlace && row.fetchedAt ? row.fetchedAt : null;
  return {
    farmId: farm.id,
    located: located(farm),
    thresholdC: farm.frostAheadC,
    fetchedAt: fetchedAt ? fetchedAt.toISOString() : null,
    stale: located(farm) && (!fetchedAt || row?.problem != null || now - fetchedAt.getTime() > 2 * ctx.config.weather.everyMs),
    problem: samePlace ? (row.problem ?? null) : null,
    triedAt: samePlace ? row.triedAt.toISOString() : null,
    hours,
    frost: frost ? { at: new Date(frost.atMs).toISOString(), lowC: frost.lowC } : null,
  };
}
