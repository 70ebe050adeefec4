// A reading (sight tube, ultrasonic distance, gauge pressure) → liquid level in mm above the tank floor.
import { STANDARD_GRAVITY_M_S2 } from '../units/index';

/**
 * Density in kg/m³ that a specific gravity of 1 stands for. We take 1000 kg/m³, the density behind the
 * conventional water-column units (1 mH₂O = 1000 kg/m³ × 9.80665 m/s² × 1 m = 9.80665 kPa, NIST SP 811
 * Appendix B), so a gauge that reads in mH₂O and this function agree exactly. Pure water at its
 * densest (about 4 °C) is 999.97 kg/m³, 0.003 % less: far below any level sensor's accuracy.
 */
export const WATER_DENSITY_KG_M3 = 1000;

/** Level in mm above the floor from a sight-tube reading in mm and the tube zero mark's height above the floor (may be negative). */
export function levelFromSightTube(readingMm: number, datumOffsetMm: number): number {
  return readingMm + datumOffsetMm;
}

/** Level in mm above the floor from the distance in mm a downward-looking sensor measures and its height in mm above the floor. */
export function levelFromUltrasonic(distanceMm: number, sensorHeightMm: number): number {
  return sensorHeightMm - distanceMm;
}

/**
 * Level in mm above the floor from gauge pressure in kPa at a sensor `sensorOffsetMm` above the floor:
 * head = P / (ρ·g) with ρ = SG × 1000 kg/m³ and g = 9.80665 m/s² (standard gravity, 3rd CGPM 1901).
 */
export function levelFromPressure(pressureKPa: number, specificGravity: number, sensorOffsetMm = 0): number {
  const headM = pressureKPa / (specificGravity * STANDARD_GRAVITY_M_S2 * (WATER_DENSITY_KG_M3 / 1000));
  return headM * 1000 + sensorOffsetMm;
}
