// The calibration table by sight-tube reading: where its rows fall for a zero mark below, at and
// above the floor, and that a row's volume is the published volume at its level.
import { describe, expect, it } from 'vitest';
import { buildTubeReadingTable, capacityL, volumeAtLevel, type TankGeometry } from '@shared/calibration/index';

const IN = 25.4;
const GAL = 3.785411784;

describe('buildTubeReadingTable', () => {
  const cylinder: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1200, heightMm: 1000 };

  it('starts at the floor, then whole steps, when the zero mark is 30 mm below the floor', () => {
    const rows = buildTubeReadingTable(cylinder, -30, 10);
    expect(rows[0]).toEqual({ readingMm: 30, levelMm: 0, volumeL: 0 });
    expect(rows[1].readingMm).toBe(40);
    expect(rows[1].levelMm).toBe(10);
    // π/4 · 1.2² m² · 0.01 m = 11.3097 L (hand derivation, V = πr²h).
    expect(rows[1].volumeL).toBeCloseTo((Math.PI / 4) * 1.44 * 10, 6);
    expect(rows.at(-1)).toEqual({ readingMm: 1030, levelMm: 1000, volumeL: capacityL(cylinder) });
    expect(rows).toHaveLength(101);
  });

  it('adds the floor row between whole steps when the offset does not fall on one', () => {
    const rows = buildTubeReadingTable(cylinder, -25, 10);
    expect(rows.slice(0, 3).map((r) => r.readingMm)).toEqual([25, 30, 40]);
    expect(rows.slice(0, 3).map((r) => r.levelMm)).toEqual([0, 5, 15]);
    expect(rows.at(-1)!.readingMm).toBe(1025);
  });

  it('starts at the zero mark when the mark is above the floor (the tube shows nothing lower)', () => {
    const rows = buildTubeReadingTable(cylinder, 50, 100);
    expect(rows[0]).toMatchObject({ readingMm: 0, levelMm: 50 });
    expect(rows.map((r) => r.readingMm)).toEqual([0, 100, 200, 300, 400, 500, 600, 700, 800, 900, 950]);
    expect(rows.at(-1)!.levelMm).toBe(1000);
  });

  it('gives the same rows as the level table when the zero mark is at the floor', () => {
    const rows = buildTubeReadingTable(cylinder, 0, 250);
    expect(rows.map((r) => [r.readingMm, r.levelMm])).toEqual([[0, 0], [250, 250], [500, 500], [750, 750], [1000, 1000]]);
  });

  it('gives the published volume at a tube reading 2 in above the level (tankvolumecalc.com, Horizontal Cylinder, Worked example: 19.2 in → 280.9 gal)', () => {
    // The same worked example tests/shared/calibration.test.ts checks the closed form with, read
    // through a tube whose zero mark sits 2 in below the floor: the tube shows 21.2 in.
    const g: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 48 * IN, lengthMm: 96 * IN, ends: 'flat' };
    const rows = buildTubeReadingTable(g, -2 * IN, 0.1 * IN);
    const row = rows.find((r) => Math.abs(r.readingMm - 21.2 * IN) < 1e-6)!;
    expect(row.levelMm).toBeCloseTo(19.2 * IN, 6);
    expect(Math.abs(row.volumeL / GAL - 280.9)).toBeLessThanOrEqual(0.05);
    expect(row.volumeL).toBeCloseTo(volumeAtLevel(g, 19.2 * IN), 9);
  });

  it('refuses a step that is not a positive number and a zero mark above the top', () => {
    expect(() => buildTubeReadingTable(cylinder, 0, 0)).toThrow(/stepMm/);
    expect(() => buildTubeReadingTable(cylinder, 1200, 10)).toThrow(/datumOffsetMm/);
  });
});
