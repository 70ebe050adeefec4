// tankSetupOf: the one mapping from a stored tank to what the reading functions take (invented tank).
import { describe, expect, it } from 'vitest';
import { readingToVolumes, tankSetupOf } from '@shared/readings';

const stored = {
  id: 7,
  name: 'Header tank',
  geometry: { shape: 'vertical-cylinder' as const, diameterMm: 1000, heightMm: 2000 },
  datumOffsetMm: -20,
  outletHeightMm: 100,
  safeFillLevelMm: 1900,
  specificGravity: 1.1,
  sensorHeightMm: 2100 as number | null,
};

describe('tankSetupOf', () => {
  it('keeps the geometry, the datum, outlet and fill heights, the specific gravity and the sensor height, and nothing else', () => {
    expect(tankSetupOf(stored)).toEqual({
      geometry: stored.geometry, datumOffsetMm: -20, outletHeightMm: 100, safeFillLevelMm: 1900, specificGravity: 1.1, sensorHeightMm: 2100,
    });
  });

  it('leaves the sensor height out when the tank has none', () => {
    expect(tankSetupOf({ ...stored, sensorHeightMm: null })).not.toHaveProperty('sensorHeightMm');
  });

  it('lets an ultrasonic distance be read with the stored sensor height: 2100 − 600 = 1500 mm (hand computation)', () => {
    const v = readingToVolumes(tankSetupOf(stored), { kind: 'ultrasonic', distanceMm: 600 });
    expect(v.ok && v.levelMm).toBe(1500);
    expect(readingToVolumes(tankSetupOf({ ...stored, sensorHeightMm: null }), { kind: 'ultrasonic', distanceMm: 600 })).toMatchObject({ ok: false, reason: expect.stringMatching(/sensor height/) });
  });
});
