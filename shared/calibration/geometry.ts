// Tank shapes and their sizes. All lengths are millimetres, all volumes litres.

/** The tank shapes the engine computes, in the order forms list them. */
export const TANK_SHAPES = [
  'vertical-cylinder',
  'cone-bottom',
  'horizontal-cylinder',
  'box',
  'frustum',
  'sphere',
  'points',
] as const;
/** A tank shape name. */
export type TankShape = (typeof TANK_SHAPES)[number];

/** End (head) types of a horizontal cylinder. */
export const HORIZONTAL_ENDS = ['flat', 'hemispherical', 'ellipsoidal-2to1'] as const;
/** A horizontal cylinder's end type. */
export type HorizontalEnds = (typeof HORIZONTAL_ENDS)[number];

/** The size fields of each shape, in the order forms show them (points: the list of marks). */
export const TANK_SHAPE_FIELDS = {
  'vertical-cylinder': ['diameterMm', 'heightMm'],
  'cone-bottom': ['diameterMm', 'straightHeightMm', 'coneHeightMm'],
  'horizontal-cylinder': ['diameterMm', 'lengthMm', 'ends'],
  box: ['lengthMm', 'widthMm', 'heightMm'],
  frustum: ['bottomDiameterMm', 'topDiameterMm', 'heightMm'],
  sphere: ['diameterMm'],
  points: ['points'],
} as const satisfies Record<TankShape, readonly string[]>;

/** Largest size accepted for any length, in mm (30 m). */
export const MAX_SIZE_MM = 30_000;
/** Largest volume accepted for a fill-and-mark point, in litres (a 30 m cube holds 27,000,000 L). */
export const MAX_POINT_VOLUME_L = 30_000_000;
/** Most fill-and-mark points a tank may have. */
export const MAX_POINTS = 500;
/** Floating-point slack, in mm, allowed past either end of a tank's level range. */
export const LEVEL_TOLERANCE_MM = 1e-9;

/** One fill-and-mark mark: a known volume in litres poured and the level in mm it reached. */
export interface CalibrationPoint {
  levelMm: number;
  volumeL: number;
}

/** Upright round tank with a flat floor. */
export interface VerticalCylinderGeometry {
  shape: 'vertical-cylinder';
  diameterMm: number;
  heightMm: number;
}
/** Upright round tank on a downward cone; level is measured from the cone's apex. */
export interface ConeBottomGeometry {
  shape: 'cone-bottom';
  diameterMm: number;
  straightHeightMm: number;
  coneHeightMm: number;
}
/** Round tank lying on its side; lengthMm is the straight shell, heads add to it; level from the shell bottom. */
export interface HorizontalCylinderGeometry {
  shape: 'horizontal-cylinder';
  diameterMm: number;
  lengthMm: number;
  ends: HorizontalEnds;
}
/** Rectangular tank (IBC tote, cistern). */
export interface BoxGeometry {
  shape: 'box';
  lengthMm: number;
  widthMm: number;
  heightMm: number;
}
/** Tapered round tank, wider at the top or at the bottom. */
export interface FrustumGeometry {
  shape: 'frustum';
  bottomDiameterMm: number;
  topDiameterMm: number;
  heightMm: number;
}
/** Spherical tank; level from its lowest point. */
export interface SphereGeometry {
  shape: 'sphere';
  diameterMm: number;
}
/**
 * Fill-and-mark tank. Points must rise strictly in level and volume. When the first point is above
 * level 0 the engine adds {levelMm: 0, volumeL: 0}; a volume above 0 at level 0 must be given as a point.
 */
export interface PointsGeometry {
  shape: 'points';
  points: readonly CalibrationPoint[];
}

/** A tank's shape and sizes, in millimetres. */
export type TankGeometry =
  | VerticalCylinderGeometry
  | ConeBottomGeometry
  | HorizontalCylinderGeometry
  | BoxGeometry
  | FrustumGeometry
  | SphereGeometry
  | PointsGeometry;
