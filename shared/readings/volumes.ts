// Level → gross, usable and ullage volumes, and the one function that turns any reading into them.
// The phone form calls readingToVolumes on every keystroke and the server calls it before storing,
// so it never throws for numeric input: every problem comes back as a reason.
import { LEVEL_TOLERANCE_MM, tankModel, validateGeometry, type TankGeometry, type TankModel } from '../calibration/index';
import { formatNumberTrimmed } from '../units/index';
import { checkProblem, figure, type CheckProblem } from '../check-problems';
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

/**
 * The level (mm) and volumes (L) a reading gives, or why it was refused: `reason` in English (the API's
 * message), `problem` the same refusal as a code of message area `checks` with its figures (for screens).
 */
export type ReadingResult = ({ ok: true; levelMm: number } & TankVolumes) | { ok: false; reason: string; problem: CheckProblem };

const mm = (v: number) => formatNumberTrimmed(v, 1);
const mmFigure = (v: number) => figure(v, 1);
const kPaFigure = (v: number) => figure(v, 3);

interface Refusal {
  reason: string;
  problem: CheckProblem;
}
const refusal = (reason: string, code: string, params: CheckProblem['params'] = {}): Refusal => ({ reason, problem: checkProblem(code, params) });

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

function setupProblem(tank: TankSetup, top: number): { field: string; detail: Refusal } | null {
  const of = (field: string, detail: Refusal) => ({ field, detail });
  const outside = (value: number) => refusal(`${mm(value)} mm is outside the tank (0–${mm(top)} mm)`, 'setup.outsideTank', { value: mmFigure(value), top: mmFigure(top) });
  const notFinite = refusal('must be a finite number of mm', 'setup.notFinite');
  if (!finite(tank.datumOffsetMm)) return of('datumOffsetMm', notFinite);
  if (Math.abs(tank.datumOffsetMm) > top + 30_000) return of('datumOffsetMm', refusal('is farther from the floor than any tank allows', 'setup.datumTooFar'));
  if (!finite(tank.outletHeightMm)) return of('outletHeightMm', notFinite);
  if (!inRange(tank.outletHeightMm, top)) return of('outletHeightMm', outside(tank.outletHeightMm));
  if (!finite(tank.safeFillLevelMm)) return of('safeFillLevelMm', notFinite);
  if (!inRange(tank.safeFillLevelMm, top)) return of('safeFillLevelMm', outside(tank.safeFillLevelMm));
  if (tank.safeFillLevelMm <= tank.outletHeightMm) {
    return of(
      'safeFillLevelMm',
      refusal(`${mm(tank.safeFillLevelMm)} mm must be above the outlet (${mm(tank.outletHeightMm)} mm)`, 'setup.fillNotAboveOutlet', {
        fill: mmFigure(tank.safeFillLevelMm),
        outlet: mmFigure(tank.outletHeightMm),
      }),
    );
  }
  if (!finite(tank.specificGravity) || tank.specificGravity <= 0) return of('specificGravity', refusal('must be a number greater than 0', 'setup.notPositive'));
  if (tank.specificGravity > MAX_SPECIFIC_GRAVITY) return of('specificGravity', refusal(`must be at most ${MAX_SPECIFIC_GRAVITY}`, 'setup.atMost', { max: figure(MAX_SPECIFIC_GRAVITY, 3) }));
  if (tank.sensorHeightMm !== undefined && !finite(tank.sensorHeightMm)) return of('sensorHeightMm', notFinite);
  return null;
}

/**
 * A level outside the tank, worded after what was read: `start` is the English opening ("Reading 12 mm puts
 * the level"), `code` the stem of the sentence's code ("reading.sightTube" → "reading.sightTubeBelowFloor").
 */
function outOfTank(start: string, code: string, params: CheckProblem['params'], levelMm: number, top: number): Refusal {
  return levelMm < 0
    ? refusal(`${start} ${mm(-levelMm)} mm below the tank floor`, `${code}BelowFloor`, { ...params, below: mmFigure(-levelMm) })
    : refusal(`${start} ${mm(levelMm - top)} mm above the top of the tank (${mm(top)} mm)`, `${code}AboveTop`, { ...params, over: mmFigure(levelMm - top), top: mmFigure(top) });
}

function levelFor(tank: TankSetup, input: ReadingInput, top: number): { levelMm: number } | Refusal {
  switch (input.kind) {
    case 'sight-tube': {
      const r = input.readingMm;
      if (!finite(r)) return refusal('Sight-tube reading must be a number of mm', 'reading.sightTubeNotNumber');
      if (r < 0) return refusal(`Reading ${mm(r)} mm is below the tube's zero mark`, 'reading.belowZero', { reading: mmFigure(r) });
      const levelMm = levelFromSightTube(r, tank.datumOffsetMm);
      if (inRange(levelMm, top)) return { levelMm };
      return tank.datumOffsetMm === 0
        ? outOfTank(`Reading ${mm(r)} mm puts the level`, 'reading.sightTube', { reading: mmFigure(r) }, levelMm, top)
        : outOfTank(`Reading ${mm(r)} mm puts the level at ${mm(levelMm)} mm,`, 'reading.sightTubeAt', { reading: mmFigure(r), level: mmFigure(levelMm) }, levelMm, top);
    }
    case 'level': {
      const levelMm = input.levelMm;
      if (!finite(levelMm)) return refusal('Level must be a number of mm', 'reading.levelNotNumber');
      if (inRange(levelMm, top)) return { levelMm };
      return outOfTank(`Level ${mm(levelMm)} mm is`, 'reading.level', { level: mmFigure(levelMm) }, levelMm, top);
    }
    case 'ultrasonic': {
      const d = input.distanceMm;
      if (!finite(tank.sensorHeightMm)) return refusal('Ultrasonic reading needs the sensor height (sensorHeightMm) in the tank setup', 'reading.noSensorHeight');
      if (!finite(d)) return refusal('Ultrasonic distance must be a number of mm', 'reading.distanceNotNumber');
      if (d < 0) return refusal(`Distance ${mm(d)} mm cannot be negative`, 'reading.distanceNegative', { distance: mmFigure(d) });
      const levelMm = levelFromUltrasonic(d, tank.sensorHeightMm);
      if (inRange(levelMm, top)) return { levelMm };
      return levelMm < 0
        ? refusal(
            `Distance ${mm(d)} mm is more than the sensor's height above the floor (${mm(tank.sensorHeightMm)} mm): the level would be ${mm(-levelMm)} mm below the tank floor`,
            'reading.distanceBeyondSensor',
            { distance: mmFigure(d), sensor: mmFigure(tank.sensorHeightMm), below: mmFigure(-levelMm) },
          )
        : outOfTank(`Distance ${mm(d)} mm puts the level`, 'reading.distance', { distance: mmFigure(d) }, levelMm, top);
    }
    case 'pressure': {
      const p = input.pressureKPa;
      const offset = tank.sensorHeightMm ?? 0;
      if (!finite(p)) return refusal('Pressure must be a number of kPa', 'reading.pressureNotNumber');
      if (p < 0) return refusal(`Pressure ${formatNumberTrimmed(p, 3)} kPa is below zero gauge: the level is below the sensor`, 'reading.pressureNegative', { pressure: kPaFigure(p) });
      // Zero gauge pressure only says the liquid is at or below a raised sensor, not where.
      if (p === 0 && offset > 0) {
        return refusal(`Pressure 0 kPa: the level is at or below the sensor (${mm(offset)} mm above the floor), so the volume is unknown`, 'reading.pressureZero', { sensor: mmFigure(offset) });
      }
      const levelMm = levelFromPressure(p, tank.specificGravity, offset);
      if (inRange(levelMm, top)) return { levelMm };
      return outOfTank(`Pressure ${formatNumberTrimmed(p, 3)} kPa puts the level`, 'reading.pressure', { pressure: kPaFigure(p) }, levelMm, top);
    }
    default: {
      const kind = String((input as { kind?: unknown }).kind);
      return refusal(`Unknown reading kind "${kind}"`, 'reading.unknownKind', { kind });
    }
  }
}

/**
 * The level in mm and the volumes in litres a reading gives in `tank`, or `{ ok: false, reason }` when the
 * reading or the setup is out of range or not a number. Never clamps a reading, never throws.
 */
export function readingToVolumes(tank: TankSetup, input: ReadingInput): ReadingResult {
  const refused = (r: Refusal): ReadingResult => ({ ok: false, ...r });
  try {
    if (!tank || typeof tank !== 'object') return refused(refusal('Tank setup is missing', 'reading.setupMissing'));
    if (!input || typeof input !== 'object') return refused(refusal('Reading is missing', 'reading.inputMissing'));
    const checked = validateGeometry(tank.geometry);
    if (!checked.ok) {
      const first = checked.issues[0];
      return refused(refusal(`Tank geometry: ${checked.message}`, 'reading.geometry', { field: first.field, detail: first.problem }));
    }
    const model = tankModel(checked.geometry);
    const top = model.heightMm;
    const problem = setupProblem(tank, top);
    if (problem) return refused(refusal(`Tank setup: ${problem.field}: ${problem.detail.reason}`, 'reading.setup', { field: problem.field, detail: problem.detail.problem }));
    const found = levelFor(tank, input, top);
    if ('reason' in found) return refused(found);
    const levelMm = snap(found.levelMm, top);
    const volumes = volumesFromModel(model, levelMm, snap(tank.outletHeightMm, top), snap(tank.safeFillLevelMm, top));
    return { ok: true, levelMm, ...volumes };
  } catch (error) {
    // Reached only by input no type allows (a getter that throws, say); still answer, never throw.
    const detail = error instanceof Error ? error.message : String(error);
    return refused(refusal(`Reading could not be computed: ${detail}`, 'reading.failed', { detail }));
  }
}
