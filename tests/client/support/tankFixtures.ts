import { calibrationVersion, capacityL, heightMm, type TankGeometry } from '@shared/calibration';
import { stockFigures, usableCapacityL } from '@shared/readings';
import { BOARD_DELTA_VERSION, type StockBoard, type Tank, type TankTile } from '@shared/schemas';

// Invented tanks of the Hollowbrook scenario the other client tests use.
const CYLINDER: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1200, heightMm: 1500 };

/** A tank as the API returns it; derived sizes come from the shared engine, never typed in. */
export function makeTank(id: number, overrides: Partial<Tank> = {}): Tank {
  const geometry = overrides.geometry ?? CYLINDER;
  const datumOffsetMm = overrides.datumOffsetMm ?? 0;
  return {
    id,
    farmId: 11,
    name: `Tank ${id}`,
    code: `CK-${id}`,
    contents: 'water',
    contentsNote: '',
    geometry,
    datumOffsetMm,
    outletHeightMm: 50,
    safeFillLevelMm: heightMm(geometry),
    lowStockL: 100,
    specificGravity: 1,
    sensorHeightMm: null,
    walkOrder: id,
    exposedToFrost: true,
    calibrationVersion: calibrationVersion(geometry, datumOffsetMm),
    heightMm: heightMm(geometry),
    capacityL: capacityL(geometry),
    archivedAt: null,
    ...overrides,
  };
}

/** A board tile for a tank with a reading of `grossL` litres. */
export function makeTile(tank: Tank, grossL: number | null): TankTile {
  const usableCapacity = usableCapacityL(tank.geometry, tank);
  return {
    tankId: tank.id,
    farmId: tank.farmId,
    name: tank.name,
    code: tank.code,
    contents: tank.contents,
    capacityL: tank.capacityL,
    usableCapacityL: usableCapacity,
    lowStockL: tank.lowStockL,
    grossL,
    usableL: grossL,
    percentOfUsableCapacity: grossL === null ? null : stockFigures({ grossL, usableL: grossL }, usableCapacity).percentOfUsableCapacity,
    levelMm: null,
    heightMm: tank.heightMm,
    datumOffsetMm: tank.datumOffsetMm,
    outletHeightMm: tank.outletHeightMm,
    safeFillLevelMm: tank.safeFillLevelMm,
    temperatureC: null,
    takenAt: grossL === null ? null : '2026-03-02T08:15:00.000Z',
    low: grossL !== null && grossL <= tank.lowStockL,
    useLPerDay: null,
    daysOfCover: null,
  };
}

/** A board holding the given tiles, one farm per farmId. */
export function boardOf(tiles: TankTile[]): StockBoard {
  const farmIds = [...new Set(tiles.map((t) => t.farmId))];
  return { generatedAt: '2026-03-02T09:00:00.000Z', stream: { version: BOARD_DELTA_VERSION, epoch: 'test-epoch', seq: 0 }, totals: [], farms: farmIds.map((farmId) => ({ farmId, name: `Farm ${farmId}`, totals: [], tanks: tiles.filter((t) => t.farmId === farmId) })) };
}
