// Calibration: tank geometry → volume at a level, level at a volume, and calibration tables.
// Lengths in millimetres (level measured from the tank's lowest point), volumes in litres.
export {
  TANK_SHAPES,
  TANK_SHAPE_FIELDS,
  HORIZONTAL_ENDS,
  MAX_SIZE_MM,
  MAX_POINT_VOLUME_L,
  MAX_POINTS,
  LEVEL_TOLERANCE_MM,
} from './geometry';
export type {
  TankGeometry,
  TankShape,
  HorizontalEnds,
  CalibrationPoint,
  VerticalCylinderGeometry,
  ConeBottomGeometry,
  HorizontalCylinderGeometry,
  BoxGeometry,
  FrustumGeometry,
  SphereGeometry,
  PointsGeometry,
} from './geometry';
export { heightMm, capacityL, volumeAtLevel, levelAtVolume, tankModel } from './engine';
export type { TankModel } from './model';
export { buildCalibrationTable, lookupVolume, MAX_TABLE_ROWS } from './table';
export type { CalibrationRow } from './table';
export { buildTubeReadingTable } from './tube-table';
export type { TubeReadingRow } from './tube-table';
export { validateGeometry, tankGeometrySchema } from './schema';
export type { GeometryValidation, GeometryIssue } from './schema';
export { calibrationVersion } from './version';
