// Level → gross, usable and ullage volumes, and the one function that turns any reading into them.
// The phone form calls readingToVolumes on every keystroke and the server calls it before storing,
// so it never throws for numeric input: every problem comes back as a reason.
import { LEVEL_TOLERANCE_MM, tankModel, validateGeometry, type TankGeometry, type TankModel } from '../calibration/index';
import { formatNumberTrimmed } from '../units/index';
import { levelFromPressure, levelFromSightTube, levelFromUltrasonic } from './levels';

/** Largest specific gravity accepted (dense brines and fertilizer concentrates stay well below). */
export const MAX_SPECIFIC_GRAVITY = 3;

/** Heights that split a tank's volume: the outlet (below it nothing drains) and the safe fill line, mm above the floor. */
export interface TankLevels {
  outletHeightMm: number;
  safeFillLevelMm: number;
}

/**
 * Volumes in litres at one level. usableL: above the outlet, never below 0. ullageL: room left up to the
 * safe fill line; 0 exactly at the line and negative when the tank is filled past it (overfilled).
 * percentFull: gross as a percentage of the brim-full capacity.
 */
export interface TankVolumes {
  grossL: number;
  usableL: number;
  ullageL: number;
  percentFull: number;
}

/** A tank as the reading functions need it; lengths in mm above the floor, SG of the contents (water = 1). */
export interface TankSetup {
  geometry: TankGeometry;
  /** Height of the sight tube's zero mark above the tank floor, mm; negative when the mark is below the floor. */
  datumOffsetMm: number;
  outletHeightMm: number;
  safeFillLevelMm: number;
  specificGravity: number;
  /** Ultrasonic: the sensor face's height above the floor. Pressure: the sensor's height above the floor (0 if absent). */
  sensorHeightMm?: number;
}

/** A reading as typed or logged: sight-tube mark, level, ultrasonic distance (mm) or gauge pressure (kPa). */
export type ReadingInput =
  | { kind: 'sight-tube'; readingMm: number }
  | { kind: 'level'; levelMm: number }
  | { kind: 'ultrasonic'; distanceMm: number }
  | { kind: 'pressure'; pressureKPa: number };

/** The level (mm) and volumes (L) a reading gives, or why it was refused. */
export type ReadingResult = ({ ok: true; levelMm: number } & TankVolumes) | { ok: false; reason: string };

const mm = (v: number) => formatNumberTrimmed(v, 1);

function volumesFromModel(model: TankModel, levelMm: number, outletHeightMm: number, safeFillLevelMm: number): TankVolumes {
  const grossL = model.volumeL(levelMm);
  return {
    grossL,
    usableL: Math.max(0, grossL - model.volumeL(outletHeightMm)),
    ullageL: model.volumeL(safeFillLevelMm) - grossL,
    percentFull: model.capacityL > 0 ? (grossL / model.capacityL) * 100 : 0,
  };
}

function snap(levelMm: number, top: number): number {
  return levelMm < 0 ? 0 : levelMm > top ? top : levelMm;
}

function inRange(levelMm: number, top: number): boolean {
  return levelMm >= -LEVEL_TOLERANCE_MM && levelMm <= top + LEVEL_TOLERANCE_MM;
}

/**
 * Gross, usable and ullage volumes in litres and percent full at `levelMm`; throws RangeError (naming the
 * field) when the geometry is invalid or a level lies outside the tank.
 */
export function tankVolumes(g: TankGeometry, levelMm: number, levels: TankLevels): TankVolumes {
  const model = tankModel(g);
  const top = model.heightMm;
  const named: [string, number][] = [
    ['levelMm', levelMm],
    ['outletHeightMm', levels.outletHeightMm],
    ['safeFillLevelMm', levels.safeFillLevelMm],
  ];
  for (const [field, value] of named) {
    if (typeof value !== 'number' || !Number.isFinite(value)) throw new RangeError(`${field}: must be a finite number of mm`);
    if (!inRange(value, top)) {
      throw new RangeError(`${field}: ${mm(value)} mm is outside the tank (0–${mm(top)} mm)`);
    }
  }
  return volumesFromModel(model, snap(levelMm, top), snap(levels.outletHeightMm, top), snap(levels.safeFillLevelMm, top));
}

const finite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

function setupProblem(tank: TankSetup, top: number): string | null {
  if (!finite(tank.datumOffsetMm)) return 'datumOffsetMm: must be a finite number of mm';
  if (Math.abs(tank.datumOffsetMm) > top + 30_000) return 'datumOffsetMm: is farther from the floor than any tank allows';
  if (!finite(tank.outletHeightMm)) return 'outletHeightMm: must be a finite number of mm';
  if (!inRange(tank.outletHeightMm, top)) return `outletHeightMm: ${mm(tank.outletHeightMm)} mm is outside the tank (0–${mm(top)} mm)`;
  if (!finite(tank.safeFillLevelMm)) return 'safeFillLevelMm: must be a finite number of mm';
  if (!inRange(tank.safeFillLevelMm, top)) return `safeFillLevelMm: ${mm(tank.safeFillLevelMm)} mm is outside the tank (0–${mm(top)} mm)`;
  if (tank.safeFillLevelMm <= tank.outletHeightMm) {
    return `safeFillLevelMm: ${mm(tank.safeFillLevelMm)} mm must be above the outlet (${mm(tank.outletHeightMm)} mm)`;
  }
  if (!finite(tank.specificGravity) || tank.specificGravity <= 0) return 'specificGravity: must be a number greater than 0';
  if (tank.specificGravity > MAX_SPECIFIC_GRAVITY) return `specificGravity: must be at most ${MAX_SPECIFIC_GRAVITY}`;
  if (tank.sensorHeightMm !== undefined && !finite(tank.sensorHeightMm)) return 'sensorHeightMm: must be a finite number of mm';
  return null;
}

function outOfTank(prefix: string, levelMm: number, top: number): string {
  return levelMm < 0
    ? `${prefix} ${mm(-levelMm)} mm below the tank floor`
    : `${prefix} ${mm(levelMm - top)} mm above the top of the tank (${mm(top)} mm)`;
}

function levelFor(tank: TankSetup, input: ReadingInput, top: number): { levelMm: number } | { reason: string } {
  switch (input.kind) {
    case 'sight-tube': {
      const r = input.readingMm;
      if (!finite(r)) return { reason: 'Sight-tube reading must be a number of mm' };
      if (r < 0) return { reason: `Reading ${mm(r)} mm is below the tube's zero mark` };
      const levelMm = levelFromSightTube(r, tank.datumOffsetMm);
      if (inRange(levelMm, top)) return { levelMm };
      const where = tank.datumOffsetMm === 0 ? `Reading ${mm(r)} mm puts the level` : `Reading ${mm(r)} mm puts the level at ${mm(levelMm)} mm,`;
      return { reason: outOfTank(where, levelMm, top) };
    }
    case 'level': {
      const levelMm = input.levelMm;
      if (!finite(levelMm)) return { reason: 'Level must be a number of mm' };
      if (inRange(levelMm, top)) return { levelMm };
      return { reason: outOfTank(`Level ${mm(levelMm)} mm is`, levelMm, top) };
    }
    case 'ultrasonic': {
      const d = input.distanceMm;
      if (!finite(tank.sensorHeightMm)) return { reason: 'Ultrasonic reading needs the sensor height (sensorHeightMm) in the tank setup' };
      if (!finite(d)) return { reason: 'Ultrasonic distance must be a number of mm' };
      if (d < 0) return { reason: `Distance ${mm(d)} mm cannot be negative` };
      const levelMm = levelFromUltrasonic(d, tank.sensorHeightMm);
      if (inRange(levelMm, top)) return { levelMm };
      return {
        reason:
          levelMm < 0
            ? `Distance ${mm(d)} mm is more than the sensor's height above the floor (${mm(tank.sensorHeightMm)} mm): the level would be ${mm(-levelMm)} mm below the tank floor`
            : outOfTank(`Distance ${mm(d)} mm puts the level`, levelMm, top),
      };
    }
    case 'pressure': {
      const p = input.pressureKPa;
      const offset = tank.sensorHeightMm ?? 0;
      if (!finite(p)) return { reason: 'Pressure must be a number of kPa' };
      if (p < 0) return { reason: `Pressure ${formatNumberTrimmed(p, 3)} kPa is below zero gauge: the level is below the sensor` };
      // Zero gauge pressure only says the liquid is at or below a raised sensor, not where.
      if (p === 0 && offset > 0) {
        return { reason: `Pressure 0 kPa: the level is at or below the sensor (${mm(offset)} mm above the floor), so the volume is unknown` };
      }
      const levelMm = levelFromPressure(p, tank.specificGravity, offset);
      if (inRange(levelMm, top)) return { levelMm };
      return { reason: outOfTank(`Pressure ${formatNumberTrimmed(p, 3)} kPa puts the level`, levelMm, top) };
    }
    default:
      return { reason: `Unknown reading kind "${String((input as { kind?: unknown }).kind)}"` };
  }
}

/**
 * The level in mm and the volumes in litres a reading gives in `tank`, or `{ ok: false, reason }` when the
 * reading or the setup is out of range or not a number. Never clamps a reading, never throws.
 */
export function readingToVolumes(tank: TankSetup, input: ReadingInput): ReadingResult {
  try {
    if (!tank || typeof tank !== 'object') return { ok: false, reason: 'Tank setup is missing' };
    if (!input || typeof input !== 'object') return { ok: false, reason: 'Reading is missing' };
    const checked = validateGeometry(tank.geometry);
    if (!checked.ok) return { ok: false, reason: `Tank geometry: ${checked.message}` };
    const model = tankModel(checked.geometry);
    const top = model.heightMm;
    const problem = setupProblem(tank, top);
    if (problem) return { ok: false, reason: `Tank setup: ${problem}` };
    const found = levelFor(tank, input, top);
    if ('reason' in found) return { ok: false, reason: found.reason };
    const levelMm = snap(found.levelMm, top);
    const volumes = volumesFromModel(model, levelMm, snap(tank.outletHeightMm, top), snap(tank.safeFillLevelMm, top));
    return { ok: true, levelMm, ...volumes };
  } catch (error) {
    // Reached only by input no type allows (a getter that throws, say); still answer, never throw.
    return { ok: false, reason: `Reading could not be computed: ${error instanceof Error ? error.message : String(error)}` };
  }
}
