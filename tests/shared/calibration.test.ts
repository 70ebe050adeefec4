// Closed forms of every tank shape checked against published worked examples.
//
// Web pages were read from a stored copy of the page (not the live site); each check names the page,
// its URL and the part of it used. A published value is checked to half a unit of its last printed
// digit (its own rounding), after converting it to litres or millimetres with exact definitions:
// 1 in = 25.4 mm, 1 US gal = 231 in³ (NIST Handbook 44, Appendix C). Where a textbook uses π ≈ 22/7,
// 3.14 or 3, the engine's value is rescaled by (that π)/π before the comparison.
// Values derived by hand are labelled "hand derivation".
import { describe, expect, it } from 'vitest';
import {
  capacityL,
  heightMm,
  levelAtVolume,
  volumeAtLevel,
  type TankGeometry,
} from '@shared/calibration/index';

const IN = 25.4; // mm per inch, exact
const FT = 12 * IN; // mm per foot, exact
const GAL = (231 * IN ** 3) / 1e6; // litres per US gallon, exact (3.785411784)
const FT3 = FT ** 3 / 1e6; // litres per cubic foot, exact (28.316846592)
const M3 = 1000; // litres per cubic metre

/** |actual − expected| ≤ tolerance, with a readable failure. */
function expectWithin(actual: number, expected: number, tolerance: number) {
  expect(Math.abs(actual - expected), `got ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

describe('vertical cylinder', () => {
  // gravel-calculator.com, "Vertical Cylinder Tank Volume Calculator", Example 1 and Example 2:
  // radius 5 m, height 10 m → ≈ 785.4 m³; filled to 4 m → ≈ 314.16 m³.
  const g: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 10_000, heightMm: 10_000 };

  it('gives the published capacity when full (gravel-calculator.com, Vertical Cylinder Tank, Example 1: 785.4 m³)', () => {
    expectWithin(capacityL(g), 785.4 * M3, 0.05 * M3);
  });

  it('gives the published volume when filled to 4 m (gravel-calculator.com, Vertical Cylinder Tank, Example 2: 314.16 m³)', () => {
    expectWithin(volumeAtLevel(g, 4000), 314.16 * M3, 0.005 * M3);
  });

  it('gives 5,760π ft³ for a 12 ft radius, 40 ft tall cylinder (wyzant.com answers #922518, cylindrical bottom of the silo)', () => {
    const silo: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 24 * FT, heightMm: 40 * FT };
    expect(capacityL(silo)).toBeCloseTo(5760 * Math.PI * FT3, 6);
  });

  it('gives π/8 m³ at half height of a 1 m × 1 m tank (hand derivation: π R² h = π · 0.5² · 0.5)', () => {
    expect(volumeAtLevel({ shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1000 }, 500)).toBeCloseTo((Math.PI / 8) * M3, 9);
  });

  it('inverts exactly when given the volume of a level (hand derivation: h = V / (π R²))', () => {
    expect(levelAtVolume(g, Math.PI * 25 * 4 * M3)).toBeCloseTo(4000, 9);
  });
});

describe('cone-bottom tank', () => {
  // processconvert.com, "Cone-Bottom Tank Volume Calculator", Worked example: D 3.0 m, straight side
  // 5.0 m, cone 1.5 m → cylinder ≈ 35.34 m³, cone ≈ 3.53 m³, total ≈ 38.88 m³.
  const plant: TankGeometry = { shape: 'cone-bottom', diameterMm: 3000, straightHeightMm: 5000, coneHeightMm: 1500 };

  it('gives the published total (processconvert.com, Cone-Bottom Tank, Worked example: 38.88 m³)', () => {
    expectWithin(capacityL(plant), 38.88 * M3, 0.005 * M3);
  });

  it('gives the published cone volume when filled to the top of the cone (processconvert.com, same example: 3.53 m³)', () => {
    expectWithin(volumeAtLevel(plant, 1500), 3.53 * M3, 0.005 * M3);
  });

  it('gives the published cylinder volume above the cone (processconvert.com, same example: 35.34 m³)', () => {
    expectWithin(capacityL(plant) - volumeAtLevel(plant, 1500), 35.34 * M3, 0.005 * M3);
  });

  // tankvolumecalc.com, "Cone-Bottom Tank volume formula", Worked example and fill-ratio table:
  // D 48 in, straight shell 60 in, cone 24 in → 532.7 gal; at a stick reading of 33.6 in → 137.9 gal.
  const stick: TankGeometry = { shape: 'cone-bottom', diameterMm: 48 * IN, straightHeightMm: 60 * IN, coneHeightMm: 24 * IN };

  it('gives the published capacity (tankvolumecalc.com, Cone-Bottom Tank, Worked example: 532.7 gal)', () => {
    expectWithin(capacityL(stick) / GAL, 532.7, 0.05);
  });

  it('gives the published volume at 33.6 in (tankvolumecalc.com, Cone-Bottom Tank, Worked example: 137.9 gal)', () => {
    expectWithin(volumeAtLevel(stick, 33.6 * IN) / GAL, 137.9, 0.05);
  });

  it.each([
    { depthPct: 10, volumePct: 0.5 },
    { depthPct: 20, volumePct: 4 },
    { depthPct: 25, volumePct: 7.9 },
    { depthPct: 40, volumePct: 25.9 },
    { depthPct: 60, volumePct: 50.6 },
    { depthPct: 90, volumePct: 87.6 },
  ])('holds $volumePct % at $depthPct % of depth (tankvolumecalc.com, Cone-Bottom Tank, fill-ratio table)', ({ depthPct, volumePct }) => {
    const pct = (volumeAtLevel(stick, (heightMm(stick) * depthPct) / 100) / capacityL(stick)) * 100;
    expectWithin(pct, volumePct, 0.05);
  });

  it('inverts the cube law inside the cone (hand derivation: V = (h/Hc)³ · Vcone, so 1/8 of the cone sits below Hc/2)', () => {
    expect(levelAtVolume(plant, volumeAtLevel(plant, 1500) / 8)).toBeCloseTo(750, 9);
  });
});

describe('horizontal cylinder with flat ends', () => {
  // tankvolumecalc.com, "Horizontal Cylinder volume formula", Worked example: D 48 in, L 96 in →
  // 752 gal; at a stick reading of 19.2 in → 280.9 gal (37.4 %).
  const g: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 48 * IN, lengthMm: 96 * IN, ends: 'flat' };

  it('gives the published capacity (tankvolumecalc.com, Horizontal Cylinder, Worked example: 752 gal)', () => {
    expectWithin(capacityL(g) / GAL, 752, 0.5);
  });

  it('gives the published volume at 19.2 in (tankvolumecalc.com, Horizontal Cylinder, Worked example: 280.9 gal)', () => {
    expectWithin(volumeAtLevel(g, 19.2 * IN) / GAL, 280.9, 0.05);
  });

  it.each([
    { depthPct: 5, volumePct: 1.9 },
    { depthPct: 10, volumePct: 5.2 },
    { depthPct: 15, volumePct: 9.4 },
    { depthPct: 20, volumePct: 14.2 },
    { depthPct: 25, volumePct: 19.6 },
    { depthPct: 30, volumePct: 25.2 },
    { depthPct: 35, volumePct: 31.2 },
    { depthPct: 45, volumePct: 43.6 },
    { depthPct: 50, volumePct: 50 },
    { depthPct: 75, volumePct: 80.4 },
    { depthPct: 90, volumePct: 94.8 },
    { depthPct: 95, volumePct: 98.1 },
  ])('holds $volumePct % at $depthPct % of depth (tankvolumecalc.com, Horizontal Cylinder, fill-ratio table)', ({ depthPct, volumePct }) => {
    const pct = (volumeAtLevel(g, (48 * IN * depthPct) / 100) / capacityL(g)) * 100;
    expectWithin(pct, volumePct, 0.05);
  });

  it('finds the published depth for a known volume (algebra.com question 1106544: 4 ft × 10 ft tank, 41 in of water upright → 17.96 in lying down)', () => {
    const lying: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 48 * IN, lengthMm: 120 * IN, ends: 'flat' };
    const waterL = (Math.PI * (24 * IN) ** 2 * 41 * IN) / 1e6;
    // The published answer rounds its central angle to 2.633 rad, so it is good to about 0.01 in.
    expectWithin(levelAtVolume(lying, waterL) / IN, 17.96, 0.01);
  });

  it('gives 16π + 6√3 ft³ for r 2 ft, L 6 ft filled to 3 ft (problem as posed on freemathhelp.com "cylinder, r = 2, L = 6, h = 3"; hand derivation: full circle less the 1 ft segment 4π/3 − √3)', () => {
    const tank: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 4 * FT, lengthMm: 6 * FT, ends: 'flat' };
    expect(volumeAtLevel(tank, 3 * FT) / FT3).toBeCloseTo(16 * Math.PI + 6 * Math.sqrt(3), 9);
  });

  it('holds 1/3 − √3/(4π) of capacity at a quarter of its diameter (hand derivation: central angle 2π/3)', () => {
    expect(volumeAtLevel(g, 12 * IN) / capacityL(g)).toBeCloseTo(1 / 3 - Math.sqrt(3) / (4 * Math.PI), 12);
  });

  it('holds half of π R² L when half full (hand derivation: symmetry)', () => {
    expect(volumeAtLevel(g, 24 * IN)).toBeCloseTo(capacityL(g) / 2, 9);
    expect(capacityL(g)).toBeCloseTo((Math.PI * (24 * IN) ** 2 * 96 * IN) / 1e6, 9);
  });
});

describe('horizontal cylinder with hemispherical ends', () => {
  // tankvolumecalc.com, "Capsule Tank (Hemispherical Heads) volume formula", Worked example: D 37 in,
  // shell 74 in → 459.3 gal; at a stick reading of 14.8 in → 169.1 gal (36.8 %).
  const capsule: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 37 * IN, lengthMm: 74 * IN, ends: 'hemispherical' };

  it('gives the published capacity (tankvolumecalc.com, Capsule Tank, Worked example: 459.3 gal)', () => {
    expectWithin(capacityL(capsule) / GAL, 459.3, 0.05);
  });

  it('gives the published volume at 14.8 in (tankvolumecalc.com, Capsule Tank, Worked example: 169.1 gal)', () => {
    expectWithin(volumeAtLevel(capsule, 14.8 * IN) / GAL, 169.1, 0.05);
  });

  it.each([
    { depthPct: 10, volumePct: 4.6 },
    { depthPct: 25, volumePct: 18.6 },
    { depthPct: 40, volumePct: 36.8 },
    { depthPct: 75, volumePct: 81.4 },
    { depthPct: 90, volumePct: 95.4 },
  ])('holds $volumePct % at $depthPct % of depth (tankvolumecalc.com, Capsule Tank, fill-ratio table for shell = 2 × D)', ({ depthPct, volumePct }) => {
    const pct = (volumeAtLevel(capsule, (37 * IN * depthPct) / 100) / capacityL(capsule)) * 100;
    expectWithin(pct, volumePct, 0.05);
  });

  // sigmafinesupport.com, "Cylindrical Horizontal Tank with One Hemispherical End", EXAMPLE: D 7 ft,
  // tangent-to-tangent 20 ft, gauge 4 ft 3 in → Vs = 59.11 ft³ (one head), V1 = 489.33 ft³ (shell).
  const d7: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 7 * FT, lengthMm: 20 * FT, ends: 'hemispherical' };
  const gaugeMm = 4.25 * FT;

  it('gives the published head volume (sigmafinesupport.com, one hemispherical end, EXAMPLE: Vs = 59.11 ft³ per head)', () => {
    const flat: TankGeometry = { ...d7, ends: 'flat' };
    const headsFt3 = (volumeAtLevel(d7, gaugeMm) - volumeAtLevel(flat, gaugeMm)) / FT3;
    expectWithin(headsFt3 / 2, 59.11, 0.005);
  });

  it('gives the published shell volume to 0.1 % (sigmafinesupport.com, same EXAMPLE: V1 = 489.33 ft³)', () => {
    // The closed form gives 489.03 ft³; the page's 489.33 ft³ is 0.06 % higher and we could not trace
    // the difference (its head term above matches to the last digit), so the shell check allows 0.1 %.
    const shellFt3 = volumeAtLevel({ ...d7, ends: 'flat' }, gaugeMm) / FT3;
    expectWithin(shellFt3, 489.33, 489.33 * 0.001);
  });

  it('adds a whole sphere when full (hand derivation: two hemispheres make one sphere, π R² L + 4/3 π R³)', () => {
    const r = 3.5 * FT;
    expect(capacityL(d7)).toBeCloseTo((Math.PI * r * r * 20 * FT + (4 / 3) * Math.PI * r ** 3) / 1e6, 6);
    expect(volumeAtLevel(d7, r)).toBeCloseTo(capacityL(d7) / 2, 6);
  });
});

describe('horizontal cylinder with 2:1 ellipsoidal ends', () => {
  // tankvolumecalc.com, "2:1 Ellipsoidal Heads volume formula", Worked example: D 40 in, shell 100 in
  // → 616.5 gal; at a stick reading of 16 in → 228.7 gal (37.1 %).
  const g: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 40 * IN, lengthMm: 100 * IN, ends: 'ellipsoidal-2to1' };

  it('gives the published capacity (tankvolumecalc.com, 2:1 Ellipsoidal Heads, Worked example: 616.5 gal)', () => {
    expectWithin(capacityL(g) / GAL, 616.5, 0.05);
  });

  it('gives the published volume at 16 in (tankvolumecalc.com, 2:1 Ellipsoidal Heads, Worked example: 228.7 gal)', () => {
    expectWithin(volumeAtLevel(g, 16 * IN) / GAL, 228.7, 0.05);
  });

  it.each([
    { depthPct: 10, volumePct: 4.9 },
    { depthPct: 25, volumePct: 19.1 },
    { depthPct: 40, volumePct: 37.1 },
    { depthPct: 60, volumePct: 62.9 },
    { depthPct: 90, volumePct: 95.1 },
  ])('holds $volumePct % at $depthPct % of depth (tankvolumecalc.com, 2:1 Ellipsoidal Heads, fill-ratio table for shell = 2.5 × D)', ({ depthPct, volumePct }) => {
    const pct = (volumeAtLevel(g, (40 * IN * depthPct) / 100) / capacityL(g)) * 100;
    expectWithin(pct, volumePct, 0.05);
  });

  it('adds πD³/24 per head when full (spikevm.com, "Partial Volume in a Horizontal Cylinder Tank with Elliptical Heads", Formula: Vc = πD³/24; chemicalengineeringsite.in, "Horizontal Cylinder + Ellipsoidal Heads", V_head = πkD³/6 with k = 0.25)', () => {
    const d = 40 * IN;
    const headsL = capacityL(g) - capacityL({ ...g, ends: 'flat' });
    expect(headsL).toBeCloseTo((2 * Math.PI * d ** 3) / 24 / 1e6, 9);
  });

  it('gives heads holding half of what hemispherical heads hold at every level (hand derivation: the 2:1 ellipsoid is the sphere scaled by 1/2 along the axis)', () => {
    const flat = { ...g, ends: 'flat' } as const;
    const hemi = { ...g, ends: 'hemispherical' } as const;
    for (const h of [0, 1, 50, 200, 508, 800, 1015, 1016]) {
      const ellHeads = volumeAtLevel(g, h) - volumeAtLevel(flat, h);
      const hemiHeads = volumeAtLevel(hemi, h) - volumeAtLevel(flat, h);
      expect(ellHeads).toBeCloseTo(hemiHeads / 2, 9);
    }
  });
});

describe('box tank', () => {
  it('gives the published capacity (NCERT Mathematics Class IX, ch. 13 "Surface Areas and Volumes", Exercise 13.5 Q2, edition not recorded, solutions at cuemath.com and teachoo.com: 6 m × 5 m × 4.5 m holds 135,000 L)', () => {
    expect(capacityL({ shape: 'box', lengthMm: 6000, widthMm: 5000, heightMm: 4500 })).toBeCloseTo(135_000, 6);
  });

  it('gives the published capacity (shaalaa.com, rain-water harvesting tank 10 m × 6 m × 3 m: 180,000 L)', () => {
    expect(capacityL({ shape: 'box', lengthMm: 10_000, widthMm: 6000, heightMm: 3000 })).toBeCloseTo(180_000, 6);
  });

  it('finds the published depth for a known inflow (hackmath.net problem 1999 "Water tank": 7.5 m × 3 m floor, 10 L/s for 5/6 h → 1.3 m)', () => {
    const g: TankGeometry = { shape: 'box', lengthMm: 7500, widthMm: 3000, heightMm: 2000 };
    expectWithin(levelAtVolume(g, 10 * 3600 * (5 / 6)) / 1000, 1.3, 0.05);
  });

  it('finds the published depth of 8 L (tinkutara.com question 66985: 40 cm × 20 cm inside, 8 L → 10 cm of water)', () => {
    expect(levelAtVolume({ shape: 'box', lengthMm: 400, widthMm: 200, heightMm: 150 }, 8)).toBeCloseTo(100, 9);
  });
});

describe('frustum tank', () => {
  it('gives the published capacity of a glass wider at the top (cracku.in, TS Police SI Main 2018, Question 157: h 14 cm, ends 4 cm and 2 cm across → 102.667 cm³ with π = 22/7; the same problem is NCERT Mathematics Class X, Exercise 13.4 Q1, recalled from memory, not re-checked)', () => {
    const glass: TankGeometry = { shape: 'frustum', bottomDiameterMm: 20, topDiameterMm: 40, heightMm: 140 };
    expectWithin((capacityL(glass) * 1000 * (22 / 7)) / Math.PI, 102.667, 0.0005);
  });

  it('gives the published capacity of a milk container (NCERT Mathematics Class X, ch. 13 "Surface Areas and Volumes", Exercise 13.4 Q4, edition not recorded, solutions at school.gradeup.co and tiwariacademy.com: h 16 cm, radii 8 cm below and 20 cm above → 10,449.92 cm³ with π = 3.14)', () => {
    const can: TankGeometry = { shape: 'frustum', bottomDiameterMm: 160, topDiameterMm: 400, heightMm: 160 };
    expectWithin((capacityL(can) * 1000 * 3.14) / Math.PI, 10_449.92, 0.005);
  });

  it('gives the published capacity of a tapered vessel (byjus.com, "A vessel is in the form of a frustum of a cone": 2 m across the top, 0.5 m the bottom, 5 m high → 6.5625 m³ with π = 3)', () => {
    const vessel: TankGeometry = { shape: 'frustum', bottomDiameterMm: 500, topDiameterMm: 2000, heightMm: 5000 };
    expectWithin((capacityL(vessel) * 3) / Math.PI, 6.5625 * M3, 0.00005 * M3);
  });

  it('gives the same capacity upside down (hand derivation: π h (R0² + R0 R1 + R1²)/3 is symmetric in the radii)', () => {
    const up: TankGeometry = { shape: 'frustum', bottomDiameterMm: 500, topDiameterMm: 2000, heightMm: 5000 };
    const down: TankGeometry = { shape: 'frustum', bottomDiameterMm: 2000, topDiameterMm: 500, heightMm: 5000 };
    expect(capacityL(down)).toBeCloseTo(capacityL(up), 9);
  });

  it('holds 992π cm³ when the milk container is half filled (hand derivation: the liquid is a frustum with radii 8 cm and 14 cm, h 8 cm)', () => {
    const can: TankGeometry = { shape: 'frustum', bottomDiameterMm: 160, topDiameterMm: 400, heightMm: 160 };
    expect(volumeAtLevel(can, 80) * 1000).toBeCloseTo(992 * Math.PI, 9);
    expect(levelAtVolume(can, (992 * Math.PI) / 1000)).toBeCloseTo(80, 9);
  });

  it('holds more in its lower half when wider at the bottom (hand derivation: radii 20 cm and 14 cm over the lower 8 cm → 2,528π cm³)', () => {
    const down: TankGeometry = { shape: 'frustum', bottomDiameterMm: 400, topDiameterMm: 160, heightMm: 160 };
    // π · 8 · (400 + 280 + 196) / 3 cm³
    expect(volumeAtLevel(down, 80) * 1000).toBeCloseTo((Math.PI * 8 * 876) / 3, 9);
  });
});

describe('sphere', () => {
  it('gives the published cap volume (novacalculator.com "Spherical Cap Volume Calculator" Example 1 and superglobalcalculator.com "Spherical Cap Volume" Example 1: R 10, h 3 → 81π ≈ 254.47)', () => {
    const g: TankGeometry = { shape: 'sphere', diameterMm: 20_000 };
    expect(volumeAtLevel(g, 3000) / M3).toBeCloseTo(81 * Math.PI, 9);
    expectWithin(volumeAtLevel(g, 3000) / M3, 254.469, 0.0005);
  });

  it('gives the published dome volume (superglobalcalculator.com "Spherical Cap Volume" Example 2: R 12 m, h 5 m → 775π/3 m³)', () => {
    expect(volumeAtLevel({ shape: 'sphere', diameterMm: 24_000 }, 5000) / M3).toBeCloseTo((775 * Math.PI) / 3, 9);
  });

  it('gives the published capacity and fill (tankvolumecalc.com, "Spherical Tank volume formula", Worked example: D 100 in → 2,266.7 gal; 40 in → 797.9 gal)', () => {
    const g: TankGeometry = { shape: 'sphere', diameterMm: 100 * IN };
    expectWithin(capacityL(g) / GAL, 2266.7, 0.05);
    expectWithin(volumeAtLevel(g, 40 * IN) / GAL, 797.9, 0.05);
  });

  it.each([
    { depthPct: 10, volumePct: 2.8 },
    { depthPct: 25, volumePct: 15.6 },
    { depthPct: 75, volumePct: 84.4 },
    { depthPct: 95, volumePct: 99.3 },
  ])('holds $volumePct % at $depthPct % of depth (tankvolumecalc.com, Spherical Tank, fill-ratio table)', ({ depthPct, volumePct }) => {
    const g: TankGeometry = { shape: 'sphere', diameterMm: 2000 };
    expectWithin((volumeAtLevel(g, 20 * depthPct) / capacityL(g)) * 100, volumePct, 0.05);
  });

  it('finds the published depth of 5.236 m³ in a 4 m sphere (problem as posed on gauthmath.com, "The volume of water in a spherical tank having diameter of 4 m is 5.236 m³", choices 1.6/1.4/1.2/1.0 m, answer 1.0 m; hand check: 5π/3 m³ at 1 m)', () => {
    expectWithin(levelAtVolume({ shape: 'sphere', diameterMm: 4000 }, 5236) / 1000, 1.0, 0.05);
  });

  it('gives the published hemisphere (NCERT Mathematics Class IX, Q5 of the sphere exercise — Exercise 13.8 recalled from memory, not re-checked — solutions at esaral.com and learn.careers360.com: bowl 10.5 cm across holds 303.1875 cm³ with π = 22/7)', () => {
    const g: TankGeometry = { shape: 'sphere', diameterMm: 105 };
    expectWithin((volumeAtLevel(g, 52.5) * 1000 * (22 / 7)) / Math.PI, 303.1875, 0.00005);
  });

  it('holds 2/3 π R³ half full and 4/3 π R³ full (hand derivation)', () => {
    const g: TankGeometry = { shape: 'sphere', diameterMm: 1000 };
    expect(volumeAtLevel(g, 500)).toBeCloseTo(((2 / 3) * Math.PI * 500 ** 3) / 1e6, 9);
    expect(capacityL(g)).toBeCloseTo(((4 / 3) * Math.PI * 500 ** 3) / 1e6, 9);
    expect(levelAtVolume(g, capacityL(g) / 2)).toBeCloseTo(500, 9);
  });
});

describe('heightMm', () => {
  it.each<[string, TankGeometry, number]>([
    ['vertical cylinder: its height', { shape: 'vertical-cylinder', diameterMm: 900, heightMm: 1790 }, 1790],
    ['cone bottom: cone plus straight side', { shape: 'cone-bottom', diameterMm: 900, straightHeightMm: 1000, coneHeightMm: 300 }, 1300],
    ['horizontal cylinder: its diameter, whatever the heads', { shape: 'horizontal-cylinder', diameterMm: 1200, lengthMm: 3000, ends: 'hemispherical' }, 1200],
    ['box: its height', { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1160 }, 1160],
    ['frustum: its height', { shape: 'frustum', bottomDiameterMm: 900, topDiameterMm: 1100, heightMm: 1400 }, 1400],
    ['sphere: its diameter', { shape: 'sphere', diameterMm: 2500 }, 2500],
    ['points: the highest mark', { shape: 'points', points: [{ levelMm: 200, volumeL: 100 }, { levelMm: 950, volumeL: 800 }] }, 950],
  ])('returns the level of the top for a %s', (_label, g, expected) => {
    expect(heightMm(g)).toBe(expected);
  });
});

describe('volumeAtLevel and levelAtVolume range checks', () => {
  const g: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1790 };

  it('throws a RangeError naming the top when the level is above the tank', () => {
    expect(() => volumeAtLevel(g, 1830)).toThrow(RangeError);
    expect(() => volumeAtLevel(g, 1830)).toThrow('Level 1,830 mm is above the top of the tank (1,790 mm)');
  });

  it('throws a RangeError when the level is below the floor', () => {
    expect(() => volumeAtLevel(g, -0.5)).toThrow('Level -0.5 mm is below the tank floor (0 mm)');
  });

  it('throws a RangeError when the level is not a number', () => {
    expect(() => volumeAtLevel(g, Number.NaN)).toThrow(RangeError);
    expect(() => volumeAtLevel(g, Number.POSITIVE_INFINITY)).toThrow(RangeError);
  });

  it('accepts a level a rounding error past either end', () => {
    expect(volumeAtLevel(g, -1e-10)).toBe(0);
    expect(volumeAtLevel(g, 1790 + 1e-10)).toBe(capacityL(g));
  });

  it('throws a RangeError when the volume is negative or above capacity', () => {
    expect(() => levelAtVolume(g, -1)).toThrow('Volume -1 L is below 0 L');
    expect(() => levelAtVolume(g, capacityL(g) + 1)).toThrow(/is more than the tank's capacity/);
    expect(() => levelAtVolume(g, Number.NaN)).toThrow(RangeError);
  });

  it('throws a RangeError naming the field when the geometry is invalid', () => {
    expect(() => volumeAtLevel({ shape: 'sphere', diameterMm: -3 }, 0)).toThrow('Invalid tank geometry: diameterMm: must be greater than 0');
  });
});
