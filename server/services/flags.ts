// Flags: raised and cleared by the rules of shared/flags whenever stock changes (and on a timer
// for stale tanks), one active flag per kind and subject, acknowledged by a person, kept as history.
import { Op, QueryTypes, type WhereOptions } from 'sequelize';
import { FLAG_LABELS, TANK_FLAG_KINDS, TEMPERATURE_FLAG_KINDS, clearableByHand, judgedTankKinds, tankFlagConditions, type FlagCondition } from '@shared/flags';
import type { Flag as FlagDto, FlagKind, SessionUser } from '@shared/schemas';
import { startPeriodicJob } from '../cluster/periodic-job';
import type { AppContext } from '../context';
import { AppError, forbidden, notFound } from '../errors';
import type { Flag, Tank } from '../models';
import { computeForecast } from './forecasts';
import { listInputs } from './inventory';
import { mailRaisedFlags, sendFlagDigests } from './flag-mail';
import { queueRaisedFlagTexts } from './flag-texts';

/**
 * Brings one subject's active flags of `kinds` (the kinds what is known now can decide) in line with
 * the conditions that hold now; active flags of other kinds are left as they are. Returns true when
 * anything changed. New flags go into `raised`.
 */
export async function reconcile(ctx: AppContext, subject: { organisationId: number; farmId: number; type: 'tank' | 'input'; id: number }, kinds: readonly FlagKind[], holding: FlagCondition[], raised: Flag[]): Promise<boolean> {
  const { Flag } = ctx.db.models;
  const now = new Date();
  const active = await Flag.findAll({ where: { subjectType: subject.type, subjectId: subject.id, activeKey: 1, kind: [...kinds] } });
  let changed = false;
  for (const c of holding) {
    const cur = active.find((f) => f.kind === c.kind);
    if (cur) {
      if (cur.message !== c.message) changed = true;
      await cur.update({ lastSeenAt: now, message: c.message, value: c.value });
    } else {
      // The unique key on (kind, subject, activeKey) makes a racing second insert fail instead of duplicating.
      const created = await Flag.create({ organisationId: subject.organisationId, farmId: subject.farmId, kind: c.kind, subjectType: subject.type, subjectId: subject.id, status: 'open', activeKey: 1, message: c.message, value: c.value, raisedAt: now, lastSeenAt: now, acknowledgedAt: null, acknowledgedById: null, ackNote: null, clearedAt: null }).catch((err: { name?: string }) => {
        if (err?.name !== 'SequelizeUniqueConstraintError') throw err;
        return null;
      });
      if (created) raised.push(created);
      changed = true;
    }
  }
  for (const f of active) {
    if (!holding.some((c) => c.kind === f.kind)) {
      await f.update({ status: 'cleared', activeKey: null, clearedAt: now });
      changed = true;
    }
  }
  return changed;
}

/** The newest temperature logged on a working brew of each tank of a farm (tank id → °C and when). */
async function latestBrewTemperatures(ctx: AppContext, farmId: number): Promise<Map<number, { at: Date; temperatureC: number }>> {
  const rows = await ctx.db.sequelize.query<{ tankId: number; at: Date; temperatureC: number }>(
    `SELECT b.tankId, t.at, t.temperatureC FROM brew_temperatures t JOIN brews b ON b.id = t.brewId
      WHERE b.farmId = :farmId AND b.status IN ('brewing', 'ready')
      AND t.at = (SELECT MAX(t2.at) FROM brew_temperatures t2 JOIN brews b2 ON b2.id = t2.brewId WHERE b2.tankId = b.tankId AND b2.status IN ('brewing', 'ready'))`,
    { replacements: { farmId }, type: QueryTypes.SELECT },
  );
  return new Map(rows.map((r) => [r.tankId, { at: new Date(r.at), temperatureC: r.temperatureC }]));
}

/** A tank's temperature now and when it was taken: the newer of its latest reading's and a temperature logged on its working brew (null: neither). */
function newestTemperature(latest: { takenAt: Date; temperatureC: number | null } | null, brew: { at: Date; temperatureC: number } | null): { at: Date; temperatureC: number } | null {
  if (brew && (!latest || latest.temperatureC === null || brew.at.getTime() >= latest.takenAt.getTime())) return brew;
  return latest && latest.temperatureC !== null ? { at: latest.takenAt, temperatureC: latest.temperatureC } : null;
}

/** When a person last cleared each temperature flag of a farm's tanks by hand (`tankId:kind` → time). */
async function clearedByHand(ctx: AppContext, farmId: number): Promise<Map<string, number>> {
  const rows = await ctx.db.sequelize.query<{ subjectId: number; kind: string; at: Date }>(
    `SELECT subjectId, kind, MAX(clearedAt) AS at FROM flags
      WHERE farmId = :farmId AND subjectType = 'tank' AND kind IN (:kinds) AND clearedById IS NOT NULL GROUP BY subjectId, kind`,
    { replacements: { farmId, kinds: [...TEMPERATURE_FLAG_KINDS] }, type: QueryTypes.SELECT },
  );
  return new Map(rows.map((r) => [`${r.subjectId}:${r.kind}`, new Date(r.at).getTime()]));
}

// Suspected leaks read up to 16 days of readings per tank; they change only with a new latest
// reading (or a correction) or as the window moves on, so each tank's are kept until then.
const leakCache = new Map<number, { key: string; leaks: { lossL: number; rateLPerHour: number }[] }>();
async function leaksOf(ctx: AppContext, tank: Tank, timeZone: string, latest: { readingId: number; takenAt: Date }) {
  const key = `${latest.readingId}:${latest.takenAt.getTime()}:${Math.floor(Date.now() / 3_600_000)}:${tank.lowStockL}:${timeZone}`;
  const kept = leakCache.get(tank.id);
  if (kept?.key === key) return kept.leaks;
  const leaks = (await computeForecast(ctx, tank, timeZone, { store: false })).leaks.map((x) => ({ lossL: x.lossL, rateLPerHour: x.rateLPerHour }));
  if (leakCache.size >= 50_000) leakCache.clear();
  leakCache.set(tank.id, { key, leaks });
  return leaks;
}

/** Evaluates every tank of some farms; returns the farms whose flags changed. */
export async function evaluateTankFlags(ctx: AppContext, organisationId: number, farmIds: number[]): Promise<number[]> {
  const { Tank, Farm, TankLatest } = ctx.db.models;
  const farms = await Farm.findAll({ where: { id: farmIds, organisationId } });
  const changedFarms = new Set<number>();
  const raised: Flag[] = [];
  const now = Date.now();
  for (const farm of farms) {
    const tanks = await Tank.findAll({ where: { farmId: farm.id, archivedAt: null } });
    const latest = new Map((await TankLatest.findAll({ where: { tankId: tanks.map((t) => t.id) } })).map((l) => [l.tankId, l]));
    const brewTemps = await latestBrewTemperatures(ctx, farm.id);
    const handCleared = await clearedByHand(ctx, farm.id);
    for (const tank of tanks) {
      const l = latest.get(tank.id);
      const temperature = newestTemperature(l ?? null, brewTemps.get(tank.id) ?? null);
      const leaks = l ? await leaksOf(ctx, tank, farm.timeZone, l) : [];
      const input = {
        name: tank.name, contents: tank.contents, usableL: l?.usableL ?? null, lowStockL: tank.lowStockL, levelMm: l?.levelMm ?? null, safeFillLevelMm: tank.safeFillLevelMm,
        temperatureC: temperature?.temperatureC ?? null, takenAt: l ? l.takenAt.getTime() : null, now, staleAfterDays: farm.staleAfterDays, coldCultureC: farm.coldCultureC, frostRiskC: farm.frostRiskC,
        leaks: leaks.map((x) => ({ lossL: x.lossL, rateLPerHour: x.rateLPerHour })),
      };
      // A flag a person cleared by hand is not raised again from the temperature they saw; a newer one may.
      const holding = farm.archivedAt
        ? []
        : tankFlagConditions(input).filter((c) => !temperature || !TEMPERATURE_FLAG_KINDS.includes(c.kind) || (handCleared.get(`${tank.id}:${c.kind}`) ?? -Infinity) < temperature.at.getTime());
      const kinds = farm.archivedAt ? TANK_FLAG_KINDS : judgedTankKinds(input);
      if (await reconcile(ctx, { organisationId, farmId: farm.id, type: 'tank', id: tank.id }, kinds, holding, raised)) changedFarms.add(farm.id);
    }
  }
  await mailRaisedFlags(ctx, organisationId, raised);
  await queueRaisedFlagTexts(ctx, organisationId, raised);
  return [...changedFarms];
}

/** Evaluates the reorder-due flag of every input of some farms; returns the farms whose flags changed. */
export async function evaluateInputFlags(ctx: AppContext, organisationId: number, farmIds: number[]): Promise<number[]> {
  const system = { id: 0, email: '', name: 'Brimstock', role: 'owner', organisationId, organisationName: '', unitSystem: 'metric', farmIds } as SessionUser;
  const changed = new Set<number>();
  const raised: Flag[] = [];
  for (const farmId of farmIds) {
    for (const i of await listInputs(ctx, system, { farmId })) {
      const holding: FlagCondition[] = i.due
        ? [{ kind: 'reorder-due', value: i.onHand, message: `${i.name}: ${round(i.onHand)} ${i.unit} on hand, at or under the reorder point of ${round(i.reorderPoint)} ${i.unit}; order ${i.suggestedQuantity} ${i.unit}` }]
        : [];
      if (await reconcile(ctx, { organisationId, farmId, type: 'input', id: i.id }, ['reorder-due'], holding, raised)) changed.add(farmId);
    }
  }
  await mailRaisedFlags(ctx, organisationId, raised);
  await queueRaisedFlagTexts(ctx, organisationId, raised);
  return [...changed];
}

const round = (v: number) => Math.round(v * 10) / 10;

async function toDtos(ctx: AppContext, rows: Flag[]): Promise<FlagDto[]> {
  const { Tank, Input, Farm, User } = ctx.db.models;
  const tankIds = rows.filter((r) => r.subjectType === 'tank').map((r) => r.subjectId);
  const inputIds = rows.filter((r) => r.subjectType === 'input').map((r) => r.subjectId);
  const tanks = new Map((tankIds.length ? await Tank.findAll({ where: { id: tankIds }, attributes: ['id', 'name', 'code'] }) : []).map((t) => [t.id, `${t.name} (${t.code})`]));
  const inputs = new Map((inputIds.length ? await Input.findAll({ where: { id: inputIds }, attributes: ['id', 'name'] }) : []).map((i) => [i.id, i.name]));
  const farms = new Map((await Farm.findAll({ where: { id: [...new Set(rows.map((r) => r.farmId))] }, attributes: ['id', 'name'] })).map((f) => [f.id, f.name]));
  const userIds = [...new Set(rows.flatMap((r) => [r.acknowledgedById, r.clearedById]).filter((v): v is number => v !== null && v !== undefined))];
  const users = new Map((userIds.length ? await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : []).map((u) => [u.id, u.name]));
  const iso = (d: Date | null) => (d ? d.toISOString() : null);
  return rows.map((r) => ({
    id: r.id, farmId: r.farmId, farmName: farms.get(r.farmId) ?? '', kind: r.kind, subjectType: r.subjectType, subjectId: r.subjectId,
    subjectName: (r.subjectType === 'tank' ? tanks.get(r.subjectId) : inputs.get(r.subjectId)) ?? '', status: r.status, message: r.message, value: r.value,
    raisedAt: r.raisedAt.toISOString(), lastSeenAt: r.lastSeenAt.toISOString(), acknowledgedAt: iso(r.acknowledgedAt),
    acknowledgedBy: r.acknowledgedById ? (users.get(r.acknowledgedById) ?? null) : null, ackNote: r.ackNote, clearedAt: iso(r.clearedAt),
    clearedBy: r.clearedById ? (users.get(r.clearedById) ?? null) : null, clearNote: r.clearNote ?? null,
  }));
}

/** Flags on the actor's farms, newest first. */
export async function listFlags(ctx: AppContext, actor: SessionUser, q: { status: string; farmId?: number; kind?: FlagKind; limit: number }): Promise<FlagDto[]> {
  const status: WhereOptions = q.status === 'all' ? {} : q.status === 'active' ? { activeKey: 1 } : { status: q.status };
  const rows = await ctx.db.models.Flag.findAll({
    where: { organisationId: actor.organisationId, farmId: q.farmId ? [q.farmId].filter((f) => actor.farmIds.includes(f)) : actor.farmIds, ...status, ...(q.kind ? { kind: q.kind } : {}) },
    order: [['raisedAt', 'DESC'], ['id', 'DESC']],
    limit: q.limit,
  });
  return toDtos(ctx, rows);
}

/** The active flags of one farm (what the socket pushes). */
export async function activeFlagsOf(ctx: AppContext, organisationId: number, farmId: number): Promise<FlagDto[]> {
  return toDtos(ctx, await ctx.db.models.Flag.findAll({ where: { organisationId, farmId, activeKey: 1 }, order: [['raisedAt', 'DESC']] }));
}

/** A person has seen a flag and says what was done; it stays active until its condition ends. */
export async function acknowledgeFlag(ctx: AppContext, actor: SessionUser, id: number, note: string): Promise<FlagDto> {
  const flag = await ctx.db.models.Flag.findOne({ where: { id, organisationId: actor.organisationId } });
  if (!flag) throw notFound('Flag');
  if (!actor.farmIds.includes(flag.farmId)) throw forbidden('You do not have access to this farm');
  if (actor.role === 'buyer' && flag.kind !== 'reorder-due') throw forbidden('Buyers acknowledge reorder flags only');
  if (flag.status === 'cleared') throw new AppError(409, 'flag_cleared', 'This flag has cleared already: its condition ended');
  await flag.update({ status: 'acknowledged', acknowledgedAt: new Date(), acknowledgedById: actor.id, ackNote: note });
  ctx.events.emit('flags', { organisationId: actor.organisationId, farmIds: [flag.farmId] });
  return (await toDtos(ctx, [flag]))[0];
}

/**
 * A person ends a temperature flag by hand, saying why (a tank drained for the winter, a thermometer
 * found in the sun). It stays cleared until a temperature newer than the clearing meets the rule again.
 * Other kinds end only with their condition (409).
 */
export async function clearFlag(ctx: AppContext, actor: SessionUser, id: number, note: string): Promise<FlagDto> {
  const flag = await ctx.db.models.Flag.findOne({ where: { id, organisationId: actor.organisationId } });
  if (!flag) throw notFound('Flag');
  if (!actor.farmIds.includes(flag.farmId)) throw forbidden('You do not have access to this farm');
  if (flag.status === 'cleared') throw new AppError(409, 'flag_cleared', 'This flag has cleared already');
  if (!clearableByHand(flag.kind)) {
    throw new AppError(409, 'flag_not_clearable', `${FLAG_LABELS[flag.kind]} ends by itself once the tank or input is back in order; acknowledge it instead`);
  }
  await flag.update({ status: 'cleared', activeKey: null, clearedAt: new Date(), clearedById: actor.id, clearNote: note });
  ctx.events.emit('flags', { organisationId: actor.organisationId, farmIds: [flag.farmId] });
  return (await toDtos(ctx, [flag]))[0];
}

/**
 * Runs the rules after every commit that changes stock (folded per farm, at most every `delayMs`)
 * and every `sweepMs` for stale tanks (plus once `firstSweepMs` after start; null: not). Returns a stop function.
 */
export function attachFlagRules(ctx: AppContext, opts: { delayMs?: number; sweepMs?: number; firstSweepMs?: number | null } = {}): () => void {
  const delayMs = opts.delayMs ?? 300;
  const pending = new Map<number, { organisationId: number; tanks: boolean; inputs: boolean; timer: NodeJS.Timeout }>();
  let running = Promise.resolve();
  const run = (farmId: number) => {
    const job = pending.get(farmId)!;
    pending.delete(farmId);
    running = running
      .then(async () => {
        const changed = new Set<number>();
        if (job.tanks) for (const f of await evaluateTankFlags(ctx, job.organisationId, [farmId])) changed.add(f);
        if (job.inputs) for (const f of await evaluateInputFlags(ctx, job.organisationId, [farmId])) changed.add(f);
        if (changed.size) ctx.events.emit('flags', { organisationId: job.organisationId, farmIds: [...changed] });
      })
      .catch((err) => ctx.logger.error({ err }, 'flag rules failed'));
  };
  const schedule = (which: 'tanks' | 'inputs') => ({ organisationId, farmIds }: { organisationId: number; farmIds: number[] }) => {
    for (const farmId of farmIds) {
      const job = pending.get(farmId);
      if (job) job[which] = true;
      else pending.set(farmId, { organisationId, tanks: which === 'tanks', inputs: which === 'inputs', timer: setTimeout(() => run(farmId), delayMs) });
    }
  };
  const onReadings = schedule('tanks');
  const onStock = schedule('inputs');
  ctx.events.on('readings', onReadings);
  ctx.events.on('brew-temperature', onReadings);
  ctx.events.on('stock', onStock);
  const evaluateAll = async () => {
    const farms = await ctx.db.models.Farm.findAll({ where: { archivedAt: { [Op.is]: null } }, attributes: ['id', 'organisationId'] }).catch(() => []);
    for (const f of farms) {
      onReadings({ organisationId: f.organisationId, farmIds: [f.id] });
      onStock({ organisationId: f.organisationId, farmIds: [f.id] });
    }
  };
  // The sweep and the digest mail each run in one process of several per period (server/cluster/periodic-job.ts);
  // shortly after start-up, every farm once: flags of data loaded while no server ran (the demo, a restore).
  const sweepMs = opts.sweepMs ?? 10 * 60_000;
  const stopSweep = startPeriodicJob(ctx, { name: 'flag-sweep', periodMs: sweepMs, firstAfterMs: opts.firstSweepMs === null ? undefined : (opts.firstSweepMs ?? 1000), work: evaluateAll });
  const stopDigest = startPeriodicJob(ctx, {
    name: 'flag-digest',
    periodMs: sweepMs,
    work: () => (running = running.then(() => sendFlagDigests(ctx).then(() => undefined)).catch((err) => ctx.logger.error({ err }, 'flag digest failed'))),
  });
  return () => {
    stopSweep();
    stopDigest();
    ctx.events.off('readings', onReadings);
    ctx.events.off('brew-temperature', onReadings);
    ctx.events.off('stock', onStock);
    for (const p of pending.values()) clearTimeout(p.timer);
  };
}
