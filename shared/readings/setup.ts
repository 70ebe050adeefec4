// The one mapping from a stored tank (an API Tank or a database row) to the setup the reading functions take.
import type { TankSetup } from './volumes';

/** The fields of a stored tank that tankSetupOf reads; lengths in mm, sensorHeightMm null when no sensor height is set. */
export type StoredTankSetup = Pick<TankSetup, 'geometry' | 'datumOffsetMm' | 'outletHeightMm' | 'safeFillLevelMm' | 'specificGravity'> & {
  sensorHeightMm?: number | null;
};

/**
 * A tank's setup as readingToVolumes and the logger reader take it: the geometry, the sight tube's datum,
 * the outlet, the safe fill line and the sensor height (mm above the floor; the sensor left out when
 * none is set) and the specific gravity of the contents. Extra fields of the tank are not copied.
 */
export function tankSetupOf(tank: StoredTankSetup): TankSetup {
  const setup: TankSetup = {
    geometry: tank.geometry,
    datumOffsetMm: tank.datumOffsetMm,
    outletHeightMm: tank.outletHeightMm,
    safeFillLevelMm: tank.safeFillLevelMm,
    specificGravity: tank.specificGravity,
  };
  if (tank.sensorHeightMm !== null && tank.sensorHeightMm !== undefined) setup.sensorHeightMm = tank.sensorHeightMm;
  return setup;
}
