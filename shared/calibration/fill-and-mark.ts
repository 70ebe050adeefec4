// Fill-and-mark tanks: monotone piecewise-cubic (Hermite) interpolation through measured points with
// the slopes of M. Steffen, "A simple method for monotonic interpolation in one dimension",
// Astronomy and Astrophysics 239 (1990) 443–450. Each slope is at most twice the smaller neighbouring
// secant, which keeps every piece inside the Fritsch–Carlson monotonicity region (SIAM J. Numer.
// Anal. 17 (1980) 238–246), so volume never falls as level rises and never overshoots a mark.
import type { CalibrationPoint } from './geometry';
import { solveLevel, type TankModel } from './model';

/** The points the engine interpolates: the given ones, with {0 mm, 0 L} first when the first mark is above 0. */
export function effectivePoints(points: readonly CalibrationPoint[]): CalibrationPoint[] {
  const out = points.map((p) => ({ levelMm: p.levelMm, volumeL: p.volumeL }));
  if (out.length && out[0].levelMm > 0) out.unshift({ levelMm: 0, volumeL: 0 });
  return out;
}

/** Steffen slopes (L per mm) at each point of strictly increasing data. */
export function steffenSlopes(x: Float64Array, y: Float64Array): Float64Array {
  const n = x.length;
  const m = new Float64Array(n);
  if (n < 2) return m;
  const h = new Float64Array(n - 1);
  const s = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) {
    h[i] = x[i + 1] - x[i];
    s[i] = (y[i + 1] - y[i]) / h[i];
  }
  if (n === 2) {
    m[0] = m[1] = s[0];
    return m;
  }
  for (let i = 1; i < n - 1; i++) {
    const p = (s[i - 1] * h[i] + s[i] * h[i - 1]) / (h[i - 1] + h[i]);
    m[i] = (Math.sign(s[i - 1]) + Math.sign(s[i])) * Math.min(Math.abs(s[i - 1]), Math.abs(s[i]), 0.5 * Math.abs(p));
  }
  m[0] = endSlope(s[0], s[1], h[0], h[1]);
  m[n - 1] = endSlope(s[n - 2], s[n - 3], h[n - 2], h[n - 3]);
  return m;
}

// Steffen's one-sided end slope: the slope of the parabola through the three end
// points, limited to [0, 2·secant] so the end piece stays monotone too.
function endSlope(s0: number, s1: number, h0: number, h1: number): number {
  const p = s0 * (1 + h0 / (h0 + h1)) - (s1 * h0) / (h0 + h1);
  if (p * s0 <= 0) return 0;
  if (Math.abs(p) > 2 * Math.abs(s0)) return 2 * s0;
  return p;
}

/** A model of a validated fill-and-mark point list. */
export class FillAndMarkModel implements TankModel {
  readonly heightMm: number;
  readonly capacityL: number;
  private readonly x: Float64Array;
  private readonly y: Float64Array;
  private readonly m: Float64Array;

  constructor(points: readonly CalibrationPoint[]) {
    const pts = effectivePoints(points);
    this.x = Float64Array.from(pts, (p) => p.levelMm);
    this.y = Float64Array.from(pts, (p) => p.volumeL);
    this.m = steffenSlopes(this.x, this.y);
    this.heightMm = this.x[this.x.length - 1];
    this.capacityL = this.y[this.y.length - 1];
  }

  /** Index i of the piece [a[i], a[i+1]] that holds `value` in the sorted array `a`. */
  private piece(a: Float64Array, value: number): number {
    let lo = 0;
    let hi = a.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (a[mid] <= value) lo = mid;
      else hi = mid;
    }
    return lo;
  }

  volumeL(h: number): number {
    const { x, y, m } = this;
    const i = this.piece(x, h);
    // Exactly at a mark the interpolant returns the mark itself, not a rounded neighbour of it.
    if (h === x[i]) return y[i];
    if (h >= this.heightMm) return this.capacityL;
    const w = x[i + 1] - x[i];
    const t = (h - x[i]) / w;
    const t2 = t * t;
    const t3 = t2 * t;
    return (2 * t3 - 3 * t2 + 1) * y[i] + (t3 - 2 * t2 + t) * w * m[i] + (-2 * t3 + 3 * t2) * y[i + 1] + (t3 - t2) * w * m[i + 1];
  }

  areaLPerMm(h: number): number {
    const { x, y, m } = this;
    const i = Math.min(this.piece(x, h), x.length - 2);
    const w = x[i + 1] - x[i];
    const t = (h - x[i]) / w;
    const t2 = t * t;
    return ((6 * t2 - 6 * t) * (y[i] - y[i + 1])) / w + (3 * t2 - 4 * t + 1) * m[i] + (3 * t2 - 2 * t) * m[i + 1];
  }

  levelMm(v: number): number {
    const { x, y } = this;
    if (v <= y[0]) return x[0];
    if (v >= this.capacityL) return this.heightMm;
    const i = this.piece(y, v);
    if (v === y[i]) return x[i];
    const guess = x[i] + ((x[i + 1] - x[i]) * (v - y[i])) / (y[i + 1] - y[i]);
    return solveLevel(this, v, x[i], x[i + 1], guess);
  }
}
