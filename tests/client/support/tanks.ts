import { BOARD_DELTA_VERSION, type FarmBoard, type StockBoard, type Tank, type TankTile } from '@shared/schemas';

// Invented tanks of an invented site ("Creek site", farm 11): an upright water tank 3.2 m across,
// 2.4 m tall, its sight-tube zero 60 mm above the floor; and a small cone-bottom culture tank.
export function makeWaterTank(overrides: Partial<Tank> = {}): Tank {
  return {
    id: 101,
    farmId: 11,
    name: 'Creek water tank',
    code: 'CS-W1',
    contents: 'water',
    contentsNote: 'Spring water',
    geometry: { shape: 'vertical-cylinder', diameterMm: 3200, heightMm: 2400 },
    datumOffsetMm: 60,
    outletHeightMm: 150,
    safeFillLevelMm: 2300,
    lowStockL: 4000,
    specificGravity: 1,
    sensorHeightMm: null,
    walkOrder: 1,
    exposedToFrost: true,
    calibrationVersion: 'v-test-w1',
    heightMm: 2400,
    capacityL: 19302,
    archivedAt: null,
    ...overrides,
  };
}

export function makeCultureTank(overrides: Partial<Tank> = {}): Tank {
  return {
    id: 102,
    farmId: 11,
    name: 'Starter cone',
    code: 'CS-C1',
    contents: 'culture',
    contentsNote: '',
    geometry: { shape: 'cone-bottom', diameterMm: 1000, straightHeightMm: 900, coneHeightMm: 350 },
    datumOffsetMm: 0,
    outletHeightMm: 40,
    safeFillLevelMm: 1150,
    lowStockL: 120,
    specificGravity: 1.01,
    sensorHeightMm: null,
    walkOrder: 2,
    exposedToFrost: true,
    calibrationVersion: 'v-test-c1',
    heightMm: 1250,
    capacityL: 798,
    archivedAt: null,
    ...overrides,
  };
}

export function makeTile(overrides: Partial<TankTile> & Pick<TankTile, 'tankId' | 'code'>): TankTile {
  return {
    farmId: 11,
    name: `Tank ${overrides.code}`,
    contents: 'water',
    capacityL: 10_000,
    usableCapacityL: 9_000,
    lowStockL: 0,
    grossL: null,
    usableL: null,
    percentOfUsableCapacity: null,
    levelMm: null,
    heightMm: 2000,
    datumOffsetMm: 0,
    outletHeightMm: 100,
    safeFillLevelMm: 1900,
    temperatureC: null,
    takenAt: null,
    low: false,
    useLPerDay: null,
    daysOfCover: null,
    ...overrides,
  };
}

/** A farm board whose totals are left empty: the client recomputes what it shows across farms. */
export function makeFarmBoard(farmId: number, name: string, tanks: TankTile[]): FarmBoard {
  return { farmId, name, totals: [], tanks: tanks.map((t) => ({ ...t, farmId })) };
}

export function makeBoard(farms: FarmBoard[], generatedAt = '2026-03-02T09:00:00.000Z', seq = 0): StockBoard {
  return { generatedAt, stream: { version: BOARD_DELTA_VERSION, epoch: 'test-epoch', seq }, totals: [], farms };
}
