// The compiled form of a tank that the public functions evaluate, and the shared level solver.

/** Cubic millimetres in one litre. */
export const MM3_PER_L = 1e6;

/** A tank compiled for fast evaluation; every argument is assumed already inside the tank's range. */
export interface TankModel extends VolumeCurve {
  /** Height from the lowest point to the top, mm. */
  readonly heightMm: number;
  /** Volume when full to the top, L. */
  readonly capacityL: number;
  /** Volume in L held at level `h` mm (0 ≤ h ≤ heightMm). */
  volumeL(h: number): number;
  /** Liquid surface area at level `h` mm, in L per mm of level (the slope of volumeL). */
  areaLPerMm(h: number): number;
  /** Level in mm that holds `v` L (0 ≤ v ≤ capacityL). */
  levelMm(v: number): number;
}

/** What the level solver needs of a model: volume and its slope at a level. */
export interface VolumeCurve {
  volumeL(h: number): number;
  areaLPerMm(h: number): number;
}

/**
 * Level in [lo, hi] where `curve.volumeL(h) = target`, by Newton steps that fall back to bisection
 * whenever a step leaves the bracket; stops when a step moves less than 1e-10 mm or the bracket is
 * that narrow.
 */
export function solveLevel(curve: VolumeCurve, target: number, lo: number, hi: number, guess: number): number {
  let h = Math.min(hi, Math.max(lo, guess));
  for (let i = 0; i < 200; i++) {
    const f = curve.volumeL(h) - target;
    if (f === 0) return h;
    if (f < 0) lo = h;
    else hi = h;
    if (hi - lo <= 1e-10) return 0.5 * (lo + hi);
    const slope = curve.areaLPerMm(h);
    let next = slope > 0 ? h - f / slope : Number.NaN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - h) <= 1e-10) return next;
    h = next;
  }
  return h;
}
