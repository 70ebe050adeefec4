// Convention used throughout this file: an injection ratio n means 1 part concentrate in n parts of
// dosed irrigation water, i.e. of the solution leaving the injector with the concentrate in it. This
// is how injector settings are marked: "1:100" is the same setting as 1 %, and 1 unit of concentrate
// makes 100 units of final solution (UMass Extension greenhouse fact sheets).

import { positive } from '../checks';

/** What injectionRatio needs: two strengths in one unit (%, g/L, ppm). */
export interface InjectionRatioInput {
  /** Strength of the concentrate in the stock tank. */
  concentrateStrength: number;
  /** Strength wanted in the irrigation water after the injector. */
  targetStrength: number;
}

function ratioOf(value: unknown): number {
  const n = positive('ratio', value);
  if (n < 1) throw new RangeError(`ratio must be at least 1 (1 part in n parts of dosed water; got ${n})`);
  return n;
}

/**
 * Injection ratio n (dimensionless) = concentrateStrength / targetStrength, read as 1 part
 * concentrate in n parts of dosed irrigation water (concentrate included).
 */
export function injectionRatio(input: InjectionRatioInput): number {
  const stock = positive('concentrateStrength', input?.concentrateStrength);
  const target = positive('targetStrength', input.targetStrength);
  if (target > stock) {
    throw new RangeError(`targetStrength (${target}) cannot be above concentrateStrength (${stock})`);
  }
  return stock / target;
}

/** Concentrate drawn (unit of irrigationVolume) while irrigationVolume of dosed water flows at ratio 1:n. */
export function concentratePerVolume(irrigationVolume: number, ratio: number): number {
  const volume = positive('irrigationVolume', irrigationVolume);
  return volume / ratioOf(ratio);
}

/** What dosingRate needs. */
export interface DosingRateInput {
  /** Flow of dosed water leaving the injector (L/min). */
  flowLPerMin: number;
  /** Injection ratio n (1 part in n parts of dosed water). */
  ratio: number;
}

/** Concentrate drawn by a suction or injector doser (L/min) at flowLPerMin of dosed water and ratio 1:n. */
export function dosingRate(input: DosingRateInput): number {
  const flow = positive('flowLPerMin', input?.flowLPerMin);
  return flow / ratioOf(input.ratio);
}
