// Closed-form volume of each shape as a function of liquid level, the cross-section area (its
// derivative, used by the inverse), and the level that holds a given volume. Internal: callers go
// through engine.ts, which validates the geometry and the level first. Models are classes, not
// closures, so compiling one per reading allocates one small object and nothing else.
import { FillAndMarkModel } from './fill-and-mark';
import type { HorizontalEnds, TankGeometry } from './geometry';
import { MM3_PER_L, solveLevel, type TankModel } from './model';

// (t − sin t) loses all its digits to cancellation for small t; the Maclaurin series keeps them.
function tMinusSin(t: number): number {
  if (t < 0.05) {
    const t2 = t * t;
    return ((t * t2) / 6) * (1 - (t2 / 20) * (1 - (t2 / 42) * (1 - (t2 / 72) * (1 - t2 / 110))));
  }
  return t - Math.sin(t);
}

/** Area in mm² of the circular segment of depth h in a circle of radius r. */
export function circularSegmentAreaMm2(r: number, h: number): number {
  // atan2 of the half-chord keeps the central angle accurate at both ends, where acos((r−h)/r) does not.
  const halfChord = Math.sqrt(Math.max(0, h * (2 * r - h)));
  const theta = 2 * Math.atan2(halfChord, r - h);
  return (r * r * tMinusSin(theta)) / 2;
}

/** Volume in mm³ of a spherical cap of height h on a sphere of radius r: π h² (3r − h) / 3. */
export function sphericalCapMm3(r: number, h: number): number {
  return (Math.PI * h * h * (3 * r - h)) / 3;
}

/** Constant cross-section: vertical cylinder and box. */
class PrismModel implements TankModel {
  readonly capacityL: number;
  private readonly areaL: number;
  constructor(
    areaMm2: number,
    readonly heightMm: number,
  ) {
    this.areaL = areaMm2 / MM3_PER_L;
    this.capacityL = this.volumeL(heightMm);
  }
  volumeL(h: number): number {
    return this.areaL * h;
  }
  areaLPerMm(): number {
    return this.areaL;
  }
  levelMm(v: number): number {
    return Math.min(this.heightMm, v / this.areaL);
  }
}

/** Vertical cylinder on a downward cone, level from the apex. */
class ConeBottomModel implements TankModel {
  readonly heightMm: number;
  readonly capacityL: number;
  private readonly shellArea: number;
  private readonly coneMm3: number;
  constructor(
    diameterMm: number,
    straightHeightMm: number,
    private readonly coneHeightMm: number,
  ) {
    const r = diameterMm / 2;
    this.shellArea = Math.PI * r * r;
    this.coneMm3 = (this.shellArea * coneHeightMm) / 3;
    this.heightMm = coneHeightMm + straightHeightMm;
    // From volumeL itself, so the top row of a table and the capacity are the same number.
    this.capacityL = this.volumeL(this.heightMm);
  }
  volumeL(h: number): number {
    const c = this.coneHeightMm;
    // Inside the cone r(h) = R·h/Hc, so V = π r(h)² h / 3 = π R² h³ / (3 Hc²).
    const mm3 = h <= c ? (this.shellArea * h * h * h) / (3 * c * c) : this.coneMm3 + this.shellArea * (h - c);
    return mm3 / MM3_PER_L;
  }
  areaLPerMm(h: number): number {
    const c = this.coneHeightMm;
    return (h <= c ? (this.shellArea * h * h) / (c * c) : this.shellArea) / MM3_PER_L;
  }
  levelMm(v: number): number {
    const c = this.coneHeightMm;
    const mm3 = v * MM3_PER_L;
    const h = mm3 <= this.coneMm3 ? Math.cbrt((3 * mm3 * c * c) / this.shellArea) : c + (mm3 - this.coneMm3) / this.shellArea;
    return Math.min(this.heightMm, Math.max(0, h));
  }
}

/** Horizontal cylinder with flat, hemispherical or 2:1 ellipsoidal heads, level from the shell bottom. */
class HorizontalCylinderModel implements TankModel {
  readonly heightMm: number;
  readonly capacityL: number;
  private readonly r: number;
  private readonly headShare: number;
  constructor(
    diameterMm: number,
    private readonly lengthMm: number,
    ends: HorizontalEnds,
  ) {
    this.r = diameterMm / 2;
    this.heightMm = diameterMm;
    // Two hemispherical heads make one sphere; two 2:1 ellipsoidal heads make that sphere squashed to
    // half its length along the axis, so at every level they hold exactly half of what it holds.
    this.headShare = ends === 'hemispherical' ? 1 : ends === 'ellipsoidal-2to1' ? 0.5 : 0;
    this.capacityL = this.volumeL(diameterMm);
  }
  volumeL(h: number): number {
    return (this.lengthMm * circularSegmentAreaMm2(this.r, h) + this.headShare * sphericalCapMm3(this.r, h)) / MM3_PER_L;
  }
  areaLPerMm(h: number): number {
    const w = h * (this.heightMm - h);
    return w > 0 ? (2 * this.lengthMm * Math.sqrt(w) + this.headShare * Math.PI * w) / MM3_PER_L : 0;
  }
  levelMm(v: number): number {
    if (v <= 0) return 0;
    if (v >= this.capacityL) return this.heightMm;
    return solveLevel(this, v, 0, this.heightMm, (this.heightMm * v) / this.capacityL);
  }
}

/** Tapered round tank: radius changes linearly from bottom to top. */
class FrustumModel implements TankModel {
  readonly capacityL: number;
  private readonly r0: number;
  private readonly k: number;
  constructor(
    bottomDiameterMm: number,
    topDiameterMm: number,
    readonly heightMm: number,
  ) {
    this.r0 = bottomDiameterMm / 2;
    this.k = (topDiameterMm / 2 - this.r0) / heightMm;
    this.capacityL = this.volumeL(heightMm);
  }
  volumeL(h: number): number {
    const r0 = this.r0;
    const r = r0 + this.k * h;
    return (Math.PI * h * (r0 * r0 + r0 * r + r * r)) / 3 / MM3_PER_L;
  }
  areaLPerMm(h: number): number {
    const r = this.r0 + this.k * h;
    return (Math.PI * r * r) / MM3_PER_L;
  }
  levelMm(v: number): number {
    if (v <= 0) return 0;
    if (v >= this.capacityL) return this.heightMm;
    const { r0, k } = this;
    const mm3 = v * MM3_PER_L;
    // V = π (r³ − r0³) / (3k) inverts in closed form; a Newton polish removes the cancellation
    // left in r − r0 when the taper is slight.
    const guess = k === 0 ? mm3 / (Math.PI * r0 * r0) : (Math.cbrt(r0 ** 3 + (3 * k * mm3) / Math.PI) - r0) / k;
    return solveLevel(this, v, 0, this.heightMm, guess);
  }
}

/** Spherical tank, level from its lowest point. */
class SphereModel implements TankModel {
  readonly heightMm: number;
  readonly capacityL: number;
  private readonly r: number;
  constructor(diameterMm: number) {
    this.r = diameterMm / 2;
    this.heightMm = diameterMm;
    this.capacityL = this.volumeL(diameterMm);
  }
  volumeL(h: number): number {
    return sphericalCapMm3(this.r, h) / MM3_PER_L;
  }
  areaLPerMm(h: number): number {
    return (Math.PI * h * (this.heightMm - h)) / MM3_PER_L;
  }
  levelMm(v: number): number {
    if (v <= 0) return 0;
    if (v >= this.capacityL) return this.heightMm;
    const r = this.r;
    // With x = h/r − 1 the cap volume gives x³ − 3x + c = 0, c = 3V/(π r³) − 2; its root in [−1, 1]
    // is 2 cos((acos(−c/2) + 4π)/3). acos is ill-conditioned near ±1, so Newton polishes the root.
    const c = (3 * v * MM3_PER_L) / (Math.PI * r * r * r) - 2;
    const x = 2 * Math.cos((Math.acos(Math.min(1, Math.max(-1, -c / 2))) + 4 * Math.PI) / 3);
    return solveLevel(this, v, 0, this.heightMm, r * (1 + x));
  }
}

/** Compiles a geometry that has already passed validation into a model for fast evaluation. */
export function compileGeometry(g: TankGeometry): TankModel {
  switch (g.shape) {
    case 'vertical-cylinder':
      return new PrismModel((Math.PI * g.diameterMm * g.diameterMm) / 4, g.heightMm);
    case 'box':
      return new PrismModel(g.lengthMm * g.widthMm, g.heightMm);
    case 'cone-bottom':
      return new ConeBottomModel(g.diameterMm, g.straightHeightMm, g.coneHeightMm);
    case 'horizontal-cylinder':
      return new HorizontalCylinderModel(g.diameterMm, g.lengthMm, g.ends);
    case 'frustum':
      return new FrustumModel(g.bottomDiameterMm, g.topDiameterMm, g.heightMm);
    case 'sphere':
      return new SphereModel(g.diameterMm);
    case 'points':
      return new FillAndMarkModel(g.points);
  }
}
