// Loads the invented demo scenario (samples/demo/scenario.json) into an empty database.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { calibrationVersion, type TankGeometry } from '@shared/calibration';
import { defaultExposedToFrost } from '@shared/flags';
import type { InputCategory, Role, TankContents } from '@shared/schemas';
import type { Database } from '../db';
import { hashPassword } from './passwords';
import { insertReadings, type NewReading } from './readings';
import { readingToVolumes, tankSetupOf } from '@shared/readings';
import { farmDayNumberOf, instantOfWallClock, wallClockOf } from '@shared/time';
import { heightMm } from '@shared/calibration';
import { QUIET_HOURS } from './forecasts';

interface Scenario {
  organisation: { name: string; code: string; currency: string };
  farms: { key: string; name: string; timeZone: string; location: string; latitude?: number; longitude?: number }[];
  people: { email: string; name: string; role: Role; password: string; farms: string[]; phone?: string; flagTexts?: 'immediate' | 'digest' }[];
  tanks: {
    farm: string;
    code: string;
    name: string;
    contents: TankContents;
    contentsNote: string;
    walkOrder: number;
    geometry: TankGeometry;
    datumOffsetMm: number;
    outletHeightMm: number;
    safeFillLevelMm: number;
    lowStockL: number;
    specificGravity: number;
  }[];
  suppliers: { key: string; name: string; contactName: string; email: string; phone: string; leadTimeDays: number; notes: string }[];
  inputs: { farm: string; supplier: string; name: string; unit: string; category: InputCategory; packSize: number; unitPrice: number; orderCost: number; holdingCostPerYear: number; usePerDay: number; onHand: number }[];
}

/** Six weeks of draws of a demo input ending at `onHand`, with a shelf count two weeks ago (invented figures). */
function demoMovements(input: { id: number; organisationId: number; farmId: number }, spec: { usePerDay: number; onHand: number }, index: number, byUserId: number | null) {
  let seed = 7_919 + index * 104_729;
  const random = () => ((seed = (seed * 16_807) % 2_147_483_647) / 2_147_483_647);
  const base = { organisationId: input.organisationId, farmId: input.farmId, inputId: input.id, orderId: null, orderLineId: null, brewId: null, byUserId };
  const uses: { at: Date; quantity: number }[] = [];
  for (let d = 42; d >= 1; d--) {
    // Not every day: about two days in three, a little more or less each time.
    if (random() < 0.33) continue;
    uses.push({ at: new Date(Date.now() - d * 86_400_000 + 9 * 3_600_000), quantity: Math.round(spec.usePerDay * 1.5 * (0.6 + random() * 0.8) * 100) / 100 });
  }
  const used = uses.reduce((t, u) => t + u.quantity, 0);
  const countAt = new Date(Date.now() - 14 * 86_400_000);
  const usedAfterCount = uses.filter((u) => u.at > countAt).reduce((t, u) => t + u.quantity, 0);
  return [
    { ...base, kind: 'receipt' as const, quantity: Math.round((spec.onHand + used) * 1.03 * 100) / 100, at: new Date(Date.now() - 44 * 86_400_000), reason: 'Opening stock' },
    ...uses.map((u) => ({ ...base, kind: 'use' as const, quantity: u.quantity, at: u.at, reason: '' })),
    // The count finds a little less than the records say (spillage), which the movements history shows.
    { ...base, kind: 'count' as const, quantity: Math.round((spec.onHand + usedAfterCount) * 100) / 100, at: countAt, reason: 'Shelf count' },
  ];
}

export function readScenario(file = resolve(import.meta.dirname, '../../samples/demo/scenario.json')): Scenario {
  return JSON.parse(readFileSync(file, 'utf8')) as Scenario;
}

/** Share of capacity each contents is drawn per day in the demo (invented figures). */
const DEMO_USE_PER_DAY = { water: 0.07, fertilizer: 0.035, 'pest-solution': 0.05, culture: 0.025 } as const;
const DEMO_DAYS = 21;

const MS_PER_DAY = 86_400_000;
/** The demo's rounds start at 07:00 farm time and each tank is read within the next 40 minutes (invented). */
const ROUND_START_MINUTES = 7 * 60;
/**
 * From 05:30 farm time a demo loaded before today's round has it walked already, a minute before loading:
 * then the last 30 × 24 h hold 30 rounds whenever it is loaded, a clock change of the month included.
 */
const ROUND_DUE_MINUTES = 5 * 60 + 30;

/** The instant of a demo round on farm-local day `dayNumber`, `minutesLate` after the rounds start. */
function roundAt(dayNumber: number, minutesLate: number, timeZone: string): Date {
  return new Date(instantOfWallClock(dayNumber * MS_PER_DAY + (ROUND_START_MINUTES + minutesLate) * 60_000, timeZone));
}

/** The farm-local day number of the newest demo round: today's from 05:30 farm time, else yesterday's. */
function newestRoundDay(now: number, timeZone: string): number {
  const today = farmDayNumberOf(now, timeZone);
  return now >= instantOfWallClock(today * MS_PER_DAY + ROUND_DUE_MINUTES * 60_000, timeZone) ? today : today - 1;
}

/**
 * Three weeks of morning sight-tube rounds for a demo tank (earlierDemoRounds adds the days before them): a steady draw with a little day-to-day
 * spread, a refill or new brew when the level runs low, and warm cultures (one cooling off). The
 * numbers come from a fixed pseudo-random sequence, so every demo database is the same.
 */
export function demoReadings(tank: import('../models').Tank, index: number, workerId: number | null, timeZone: string): NewReading[] {
  let seed = 9_301 + index * 49_297;
  const random = () => ((seed = (seed * 16_807) % 2_147_483_647) / 2_147_483_647);
  const setup = tankSetupOf(tank);
  const top = Math.min(tank.safeFillLevelMm, heightMm(tank.geometry));
  const span = top - tank.outletHeightMm;
  let fraction = 0.55 + random() * 0.35;
  const out: NewReading[] = [];
  // One round per farm-local morning, so each farm day (the day series' bucket) has its own, whatever the
  // time the demo is loaded; the newest is this morning's, or yesterday's before 05:30 farm time.
  const now = Date.now();
  const newestDay = newestRoundDay(now, timeZone);
  // The gate tank is read only now and then: its last reading is four days old.
  const lastDay = tank.code === 'SO-W2' ? 4 : 0;
  for (let d = DEMO_DAYS; d >= lastDay; d--) {
    if (d < DEMO_DAYS) fraction -= DEMO_USE_PER_DAY[tank.contents] * (tank.geometry.shape === 'sphere' ? 0.5 : 1) * (0.6 + random() * 0.8) * (heightMm(tank.geometry) / span);
    if (fraction < 0.18) fraction = 0.88 + random() * 0.08;
    const levelMm = Math.round(tank.outletHeightMm + Math.max(0.02, fraction) * span);
    const v = readingToVolumes(setup, { kind: 'level', levelMm });
    if (!v.ok) continue;
    const walked = roundAt(newestDay - d, Math.round(random() * 40), timeZone);
    const takenAt = d === 0 && walked.getTime() > now - 60_000 ? new Date(now - 60_000) : walked;
    const cooling = tank.code === 'HR-C2' && d <= 2;
    // This morning's round: the cistern's float valve stuck open overnight, and the fertigation tote stood in a hard frost.
    const overfilled = tank.code === 'SO-W1' && d === 0;
    const frosty = tank.code === 'MF-F1' && d === 0;
    const readLevelMm = overfilled ? tank.safeFillLevelMm + 35 : levelMm;
    const rv = overfilled ? readingToVolumes(setup, { kind: 'level', levelMm: readLevelMm }) : v;
    if (!rv.ok) continue;
    out.push({
      organisationId: tank.organisationId, farmId: tank.farmId, tankId: tank.id, takenAt, source: 'round', levelMm: readLevelMm, grossL: rv.grossL, usableL: rv.usableL,
      temperatureC: tank.contents === 'culture' ? Math.round((cooling ? 17.2 - d * 0.4 : 21 + random() * 3) * 10) / 10 : frosty ? 1.5 : null,
      calibrationVersion: tank.calibrationVersion, enteredById: workerId, importId: null, note: frosty ? 'Ice on the lid' : '', idempotencyKey: null,
    });
  }
  return tank.code === 'MF-W1' ? withLeakNight(out, setup, timeZone) : out;
}

/** Days before the three weeks of rounds that the demo also fills, so a month's history has a reading every day. */
const DEMO_EARLIER_DAYS = 12;

/**
 * The rounds of the twelve days before `rounds` (the tank's three weeks), worked backwards from the
 * oldest of them with a sequence of their own, so the three weeks stay exactly as they are: going back
 * a day adds that day's draw, and a level that would pass the fill line was a refill, with the tank
 * low before it. Invented figures, the same in every demo database.
 */
export function earlierDemoRounds(tank: import('../models').Tank, rounds: NewReading[], index: number, timeZone: string): NewReading[] {
  const oldest = rounds.find((r) => r.source === 'round');
  if (!oldest) return [];
  const oldestDay = farmDayNumberOf(oldest.takenAt.getTime(), timeZone);
  let seed = 7_877 + index * 31_337;
  const random = () => ((seed = (seed * 16_807) % 2_147_483_647) / 2_147_483_647);
  const setup = tankSetupOf(tank);
  const top = Math.min(tank.safeFillLevelMm, heightMm(tank.geometry));
  const span = top - tank.outletHeightMm;
  let fraction = (oldest.levelMm - tank.outletHeightMm) / span;
  const out: NewReading[] = [];
  for (let d = 1; d <= DEMO_EARLIER_DAYS; d++) {
    fraction += DEMO_USE_PER_DAY[tank.contents] * (tank.geometry.shape === 'sphere' ? 0.5 : 1) * (0.6 + random() * 0.8) * (heightMm(tank.geometry) / span);
    if (fraction > 0.92) fraction = 0.2 + random() * 0.1;
    const levelMm = Math.round(tank.outletHeightMm + Math.max(0.02, fraction) * span);
    const v = readingToVolumes(setup, { kind: 'level', levelMm });
    if (!v.ok) continue;
    const takenAt = roundAt(oldestDay - d, 20 + Math.round((random() - 0.5) * 40), timeZone);
    out.unshift({
      ...oldest, takenAt, levelMm, grossL: v.grossL, usableL: v.usableL,
      temperatureC: tank.contents === 'culture' ? Math.round((21 + random() * 3) * 10) / 10 : null, note: '',
    });
  }
  return out;
}

/**
 * The header tank's logger saw a steady loss through last night's quiet hours (about 60 L/h, with
 * no irrigation planned): a fitting weeping somewhere. Readings every 30 minutes through the newest
 * stretch of quiet hours clear of any round before the latest one (invented figures).
 */
function withLeakNight(rounds: NewReading[], setup: Parameters<typeof readingToVolumes>[0], zone: string): NewReading[] {
  const last = rounds[rounds.length - 1];
  if (!last) return rounds;
  const hourOf = (at: number) => Math.floor(wallClockOf(at, zone) / 3_600_000) % 24;
  const quiet = (at: number) => hourOf(at) >= QUIET_HOURS.startHour || hourOf(at) < QUIET_HOURS.endHour;
  const nearRound = (at: number) => rounds.some((r) => Math.abs(r.takenAt.getTime() - at) < 45 * 60_000);
  const steps: number[] = [];
  const start = Math.floor((last.takenAt.getTime() - 30 * 3_600_000) / 1_800_000) * 1_800_000;
  for (let at = start; at < last.takenAt.getTime(); at += 1_800_000) if (quiet(at) && !nearRound(at)) steps.push(at);
  // The newest run of back-to-back half hours at least two hours long (a round in the night splits it).
  const runs: number[][] = [];
  for (const at of steps) {
    const run = runs[runs.length - 1];
    if (run && at - run[run.length - 1] === 1_800_000) run.push(at);
    else runs.push([at]);
  }
  const night = runs.filter((r) => r.length >= 4).pop();
  if (!night) return rounds;
  const first = night[0];
  const end = night[night.length - 1];
  const before = [...rounds].reverse().find((r) => r.takenAt.getTime() < first);
  const after = rounds.find((r) => r.takenAt.getTime() > end);
  // Quiet all the way between two instants: one quiet period, which the leak rule reads as a whole.
  const oneQuietPeriod = (a: number, b: number) => {
    for (let at = a; at <= b; at += 15 * 60_000) if (!quiet(at)) return false;
    return true;
  };
  // The readings fall 5 mm a half hour from the round that shares their quiet period (or into the
  // next round), so the quiet hours hold only the leak, never a day's draw.
  const fromBefore = before !== undefined && oneQuietPeriod(before.takenAt.getTime(), first);
  const anchor = fromBefore ? before : after;
  if (!anchor) return rounds;
  const levelAt = (i: number) => Math.round(fromBefore ? anchor.levelMm! - 5 - i * 5 : anchor.levelMm! + 5 + (night.length - 1 - i) * 5);
  const logger = night.flatMap((at, i) => {
    const levelMm = levelAt(i);
    const v = readingToVolumes(setup, { kind: 'level', levelMm });
    return v.ok ? [{ ...anchor, takenAt: new Date(at), source: 'logger' as const, levelMm, grossL: v.grossL, usableL: v.usableL, temperatureC: null, enteredById: null, note: '', idempotencyKey: null }] : [];
  });
  return [...rounds, ...logger];
}

/** Loads the scenario; with onlyIfEmpty, does nothing when an organisation exists. Returns true when loaded. */
export async function loadDemoScenario(db: Database, opts: { onlyIfEmpty?: boolean } = {}): Promise<boolean> {
  const { Organisation, Farm, User, FarmAccess, Tank, TankCalibration, TankContentsPeriod, Supplier, Input, StockMovement } = db.models;
  if (opts.onlyIfEmpty && (await Organisation.count()) > 0) return false;
  const scenario = readScenario();
  const hashes = await Promise.all(scenario.people.map((p) => hashPassword(p.password)));
  await db.sequelize.transaction(async (transaction) => {
    const org = await Organisation.create({ name: scenario.organisation.name, code: scenario.organisation.code, currency: scenario.organisation.currency }, { transaction });
    const farmIds = new Map<string, number>();
    for (const f of scenario.farms) {
      const farm = await Farm.create({ organisationId: org.id, name: f.name, timeZone: f.timeZone, location: f.location, latitude: f.latitude ?? null, longitude: f.longitude ?? null, archivedAt: null }, { transaction });
      farmIds.set(f.key, farm.id);
    }
    for (const [i, p] of scenario.people.entries()) {
      const user = await User.create(
        { organisationId: org.id, email: p.email, name: p.name, role: p.role, passwordHash: hashes[i], lastSignInAt: null, phone: p.phone ?? null, flagTexts: p.flagTexts ?? 'off' },
        { transaction },
      );
      for (const key of p.farms) {
        await FarmAccess.create({ userId: user.id, farmId: farmIds.get(key)!, organisationId: org.id }, { transaction });
      }
    }
    const since = new Date(Date.now() - 60 * 86_400_000);
    const readings: NewReading[] = [];
    let rounds = 0;
    const worker = await User.findOne({ where: { organisationId: org.id, role: 'worker' }, transaction });
    const manager = await User.findOne({ where: { organisationId: org.id, role: 'manager' }, transaction });
    const workerFarms = new Set((await FarmAccess.findAll({ where: { userId: worker?.id ?? 0 }, transaction })).map((a) => a.farmId));
    // The worker walks the farms they were given; the manager reads the rest.
    const readerOf = (farmId: number) => (workerFarms.has(farmId) ? worker?.id : manager?.id) ?? null;
    const zones = new Map(scenario.farms.map((f) => [farmIds.get(f.key)!, f.timeZone]));
    const timeZoneOf = (id: number) => zones.get(id) ?? 'UTC';
    for (const { farm, ...t } of scenario.tanks) {
      const version = calibrationVersion(t.geometry, t.datumOffsetMm);
      const tank = await Tank.create({ ...t, organisationId: org.id, farmId: farmIds.get(farm)!, exposedToFrost: defaultExposedToFrost(t.contents), sensorHeightMm: null, calibrationVersion: version, archivedAt: null }, { transaction });
      // Measured when the tank was set up, before any of its readings (the tank page dates the calibration).
      await TankCalibration.create({ organisationId: org.id, tankId: tank.id, version, geometry: t.geometry, datumOffsetMm: t.datumOffsetMm, createdAt: since }, { transaction });
      await TankContentsPeriod.create({ organisationId: org.id, tankId: tank.id, contents: t.contents, contentsNote: t.contentsNote, specificGravity: t.specificGravity, fromAt: since, toAt: null, changedById: null }, { transaction });
      const made = demoReadings(tank, rounds, readerOf(tank.farmId), timeZoneOf(tank.farmId));
      // Counted before the earlier days are added, so every tank's three weeks come out as they always have.
      rounds += made.filter((r) => r.source === 'round').length;
      readings.push(...earlierDemoRounds(tank, made, rounds, timeZoneOf(tank.farmId)), ...made);
    }
    const supplierIds = new Map<string, number>();
    for (const { key, ...sup } of scenario.suppliers) supplierIds.set(key, (await Supplier.create({ ...sup, organisationId: org.id, archivedAt: null }, { transaction })).id);
    const buyer = await User.findOne({ where: { organisationId: org.id, role: 'buyer' }, transaction });
    for (const [i, { farm, supplier, usePerDay, onHand, ...spec }] of scenario.inputs.entries()) {
      const input = await Input.create(
        { ...spec, organisationId: org.id, farmId: farmIds.get(farm)!, supplierId: supplierIds.get(supplier) ?? null, leadTimeDays: null, serviceLevel: 0.95, minimumOrder: 0, notes: '', archivedAt: null },
        { transaction },
      );
      await StockMovement.bulkCreate(demoMovements(input, { usePerDay, onHand }, i, readerOf(input.farmId) ?? buyer?.id ?? null), { transaction });
    }
    await insertReadings({ db }, readings, new Map([...farmIds.values()].map((id) => [id, timeZoneOf(id)])), transaction);
  });
  return true;
}
