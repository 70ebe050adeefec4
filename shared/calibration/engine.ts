import { formatNumberTrimmed } from '../units/index';
import { LEVEL_TOLERANCE_MM, type TankGeometry } from './geometry';
import type { TankModel } from './model';
import { validateGeometry } from './schema';
import { compileGeometry } from './solids';

const mm = (v: number) => formatNumberTrimmed(v, 3);
const litres = (v: number) => formatNumberTrimmed(v, 3);

/**
 * `g` validated and compiled for repeated evaluation (volumes in L, levels in mm); its methods trust their
 * arguments to lie inside the tank. Throws RangeError naming the field when `g` is not a valid geometry.
 */
export function tankModel(g: TankGeometry): TankModel {
  const checked = validateGeometry(g);
  if (!checked.ok) throw new RangeError(`Invalid tank geometry: ${checked.message}`);
  return compileGeometry(checked.geometry);
}

/** `levelMm` checked against a model: snapped into [0, top] within 1e-9 mm, else RangeError. */
function checkedLevel(model: TankModel, levelMm: number): number {
  if (typeof levelMm !== 'number' || !Number.isFinite(levelMm)) {
    throw new RangeError(`Level must be a finite number of mm (got ${String(levelMm)})`);
  }
  if (levelMm < 0) {
    if (levelMm < -LEVEL_TOLERANCE_MM) throw new RangeError(`Level ${mm(levelMm)} mm is below the tank floor (0 mm)`);
    return 0;
  }
  if (levelMm > model.heightMm) {
    if (levelMm > model.heightMm + LEVEL_TOLERANCE_MM) {
      throw new RangeError(`Level ${mm(levelMm)} mm is above the top of the tank (${mm(model.heightMm)} mm)`);
    }
    return model.heightMm;
  }
  return levelMm;
}

/** Height in mm from the tank's lowest point (the level datum) to its top. */
export function heightMm(g: TankGeometry): number {
  return tankModel(g).heightMm;
}

/** Volume in litres of the tank filled to its top. */
export function capacityL(g: TankGeometry): number {
  return tankModel(g).capacityL;
}

/**
 * Volume in litres held at level `levelMm` (mm above the lowest point), by the shape's closed form;
 * throws RangeError below 0 or above the top (1e-9 mm of slack for rounding).
 */
export function volumeAtLevel(g: TankGeometry, levelMm: number): number {
  const model = tankModel(g);
  return model.volumeL(checkedLevel(model, levelMm));
}

/**
 * Level in mm that holds `volumeL` litres: exact closed form for cylinder, box and cone bottom; closed
 * form polished by Newton for frustum and sphere; Newton guarded by bisection, to within 1e-10 mm of the
 * computed curve, for horizontal and fill-and-mark tanks. RangeError outside 0..capacity (or, for a
 * fill-and-mark tank holding a volume at level 0, below that volume).
 */
export function levelAtVolume(g: TankGeometry, volumeL: number): number {
  const model = tankModel(g);
  if (typeof volumeL !== 'number' || !Number.isFinite(volumeL)) {
    throw new RangeError(`Volume must be a finite number of litres (got ${String(volumeL)})`);
  }
  // Relative slack: a capacity typed back from a rounded display must not be refused.
  const slack = 1e-12 * Math.max(1, model.capacityL);
  // A fill-and-mark tank may hold a volume at level 0 (a sump below the lowest mark); less than that
  // is no level at all.
  const floorL = model.volumeL(0);
  if (volumeL < floorL - slack) {
    throw new RangeError(
      floorL > 0
        ? `Volume ${litres(volumeL)} L is below the ${litres(floorL)} L the tank holds at level 0 mm`
        : `Volume ${litres(volumeL)} L is below 0 L`,
    );
  }
  if (volumeL > model.capacityL + slack) {
    throw new RangeError(`Volume ${litres(volumeL)} L is more than the tank's capacity (${litres(model.capacityL)} L)`);
  }
  return model.levelMm(Math.min(model.capacityL, Math.max(floorL, volumeL)));
}
