// Gauge-strip layout: marks at the levels that hold each volume, page tiling and the refusals.
//
// Mark positions are checked against levels worked out here by hand from the solids' volume formulas
// (not from the calibration engine), and against published worked examples of "what level holds this
// volume" already used by the calibration tests (web pages read from a stored copy, not the live site).
// The hand formulas and their source (CRC Standard Mathematical Tables and Formulae) are in
// tests/support/hand-tanks.ts.
// Exact definitions: 1 in = 25.4 mm, 1 US gal = 231 in³ (NIST Handbook 44, Appendix C).
// Paper: A4 is 210 × 297 mm (ISO 216; value recalled from memory of the standard, matching the size
// tables printers' documentation gives) and US Letter 8.5 × 11 in (ANSI/ASME Y14.1 "A" size, recalled
// from memory, not re-checked). Values derived by hand are labelled "hand derivation".
import { describe, expect, it } from 'vitest';
import type { TankGeometry } from '@shared/calibration/index';
import {
  GAUGE_HEADER_MM,
  GaugeStripError,
  gaugePage,
  gaugeStripLayout,
  MAX_GAUGE_PAGES,
  MIN_TICK_GAP_MM,
  MINOR_LABEL_GAP_MM,
  suggestGaugeStep,
  SUGGESTED_TICK_GAP_MM,
  type GaugeStripInput,
  type GaugeStripLayout,
} from '@shared/gauge/index';
import { box, coneBottom, frustum, horizontalWithHalfHeads, sphere, uprightCylinder, type HandTank } from '../support/hand-tanks';

const IN = 25.4; // mm per inch, exact
const GAL = (231 * IN ** 3) / 1e6; // litres per US gallon, exact (3.785411784)

/** |actual − expected| ≤ tolerance, with a readable failure. */
function expectWithin(actual: number, expected: number, tolerance: number) {
  expect(Math.abs(actual - expected), `got ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

const allTicks = (l: GaugeStripLayout) => l.pages.flatMap((p) => p.ticks);

/** Tube positions of k·stepL for every k whose level is on the strip, from the hand inverse. */
function expectedPositions(tank: HandTank, datumOffsetMm: number, stepL: number) {
  const out: { k: number; positionMm: number }[] = [];
  for (let k = 0; k * stepL <= tank.capacityL * (1 + 1e-12); k++) {
    const positionMm = tank.levelMm(Math.min(tank.capacityL, k * stepL)) - datumOffsetMm;
    if (positionMm >= 0) out.push({ k, positionMm });
  }
  return out;
}

const SHAPES: [string, TankGeometry, number, number][] = [
  ['vertical cylinder, zero mark at the floor', { shape: 'vertical-cylinder', diameterMm: 1200, heightMm: 1800 }, 0, 25],
  ['cone-bottom tank, zero mark 35 mm up the cone', { shape: 'cone-bottom', diameterMm: 900, straightHeightMm: 800, coneHeightMm: 400 }, 35, 10],
  ['horizontal cylinder with 2:1 heads, zero mark 20 mm below the shell', { shape: 'horizontal-cylinder', diameterMm: 1000, lengthMm: 2000, ends: 'ellipsoidal-2to1' }, -20, 20],
  ['IBC tote', { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1000 }, 0, 10],
  ['frustum wider at the top', { shape: 'frustum', bottomDiameterMm: 900, topDiameterMm: 1100, heightMm: 1200 }, 50, 20],
  ['sphere', { shape: 'sphere', diameterMm: 1500 }, 0, 25],
  ['fill-and-mark tank', { shape: 'points', points: [{ levelMm: 0, volumeL: 0 }, { levelMm: 200, volumeL: 100 }, { levelMm: 500, volumeL: 300 }, { levelMm: 900, volumeL: 520 }] }, 0, 5],
];

/** The solid shapes of SHAPES with their hand formulas, and a first mark worked out by hand as a number. */
const HAND_SHAPES: [string, TankGeometry, number, number, HandTank, { volumeL: number; positionMm: number }][] = [
  // 25 L / (π · 0.6² m²) = 22.1049 mm.
  [SHAPES[0][0], SHAPES[0][1], 0, 25, uprightCylinder(1200, 1800), { volumeL: 25, positionMm: 22.104853 }],
  // Inside the cone: ∛(3 · 10 L · 400² mm² / (π · 450² mm²)) = 196.1352 mm, less the 35 mm zero mark.
  [SHAPES[1][0], SHAPES[1][1], 35, 10, coneBottom(900, 800, 400), { volumeL: 10, positionMm: 161.135156 }],
  // 20 L: 2,000 mm · segment(h) + π h² (1,500 − h)/6 = 20·10⁶ mm³ at h = 37.2271 mm (bisection by hand), plus the 20 mm below the shell.
  [SHAPES[2][0], SHAPES[2][1], -20, 20, horizontalWithHalfHeads(1000, 2000), { volumeL: 20, positionMm: 57.227107 }],
  // 10 L over 1.2 m² of floor is 8.3333 mm.
  [SHAPES[3][0], SHAPES[3][1], 0, 10, box(1200, 1000, 1000), { volumeL: 10, positionMm: 25 / 3 }],
  // k = 100/1200; (∛(450³ + 3k · 20 L/π) − 450) / k = 31.2567 mm is under the 50 mm zero mark, so the first mark
  // shown is 40 L: (∛(450³ + 3k · 40 L/π) − 450) / k − 50 = 12.1578 mm.
  [SHAPES[4][0], SHAPES[4][1], 50, 20, frustum(900, 1100, 1200), { volumeL: 40, positionMm: 12.157802 }],
  // q = 3 · 25 L / (π · 0.75³ m³) − 2; 750 · (1 + 2 cos(acos(−q/2)/3 − 2π/3)) = 105.5100 mm.
  [SHAPES[5][0], SHAPES[5][1], 0, 25, sphere(1500), { volumeL: 25, positionMm: 105.510015 }],
];

describe('gaugeStripLayout', () => {
  it.each(HAND_SHAPES)('puts every mark at the level that holds k·N by the solid’s formula (hand derivation) for a %s', (_name, geometry, datumOffsetMm, everyL, tank, first) => {
    const layout = gaugeStripLayout({ geometry, datumOffsetMm, everyL, unitSystem: 'metric' });
    const want = expectedPositions(tank, datumOffsetMm, everyL);
    const got = allTicks(layout);
    expect(got.map((t) => t.volumeL)).toEqual(want.map((w) => w.k * everyL));
    got.forEach((t, i) => expectWithin(t.positionMm, want[i].positionMm, 1e-6));
    got.forEach((t) => expectWithin(t.levelMm - datumOffsetMm, t.positionMm, 1e-9));
    expectWithin(got.find((t) => t.volumeL === first.volumeL)!.positionMm, first.positionMm, 1e-6);
  });

  it.each(SHAPES)('puts the top of the strip at the tank’s height less the zero mark for a %s', (_name, geometry, datumOffsetMm, everyL) => {
    const heights: Record<TankGeometry['shape'], number> = { 'vertical-cylinder': 1800, 'cone-bottom': 1200, 'horizontal-cylinder': 1000, box: 1000, frustum: 1200, sphere: 1500, points: 900 };
    expect(gaugeStripLayout({ geometry, datumOffsetMm, everyL, unitSystem: 'metric' }).topPositionMm).toBe(heights[geometry.shape] - datumOffsetMm);
  });

  it('puts the marks of a fill-and-mark tank on its measured points and in order between them (the points are the published values)', () => {
    const [, geometry] = SHAPES[6];
    const ticks = allTicks(gaugeStripLayout({ geometry, datumOffsetMm: 0, everyL: 5, unitSystem: 'metric' }));
    expect(ticks.map((t) => t.volumeL)).toEqual(Array.from({ length: 105 }, (_, k) => k * 5));
    const at = (volumeL: number) => ticks.find((t) => t.volumeL === volumeL)!.positionMm;
    expect([at(0), at(100), at(300), at(520)]).toEqual([0, 200, 500, 900]);
    for (let i = 1; i < ticks.length; i++) expect(ticks[i].positionMm).toBeGreaterThan(ticks[i - 1].positionMm);
    for (const t of ticks) {
      if (t.volumeL < 100) expect(t.positionMm).toBeLessThan(200);
      else if (t.volumeL < 300) expect(t.positionMm).toBeLessThan(500);
    }
  });

  it('puts the 8 L mark at the published 10 cm (tinkutara.com question 66985: 40 cm × 20 cm inside, 8 L → 10 cm of water)', () => {
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 400, widthMm: 200, heightMm: 150 }, datumOffsetMm: 0, everyL: 8, unitSystem: 'metric' });
    const mark = allTicks(layout).find((t) => t.volumeL === 8)!;
    expect(mark.positionMm).toBeCloseTo(100, 9);
    expect(mark.label).toBe('8 L');
  });

  it('puts the 5,236 L mark at the published 1.0 m in a 4 m sphere (problem as posed on gauthmath.com, "The volume of water in a spherical tank having diameter of 4 m is 5.236 m³": depth 1.0 m)', () => {
    const layout = gaugeStripLayout({ geometry: { shape: 'sphere', diameterMm: 4000 }, datumOffsetMm: 0, everyL: 5236, unitSystem: 'metric', page: gaugePage('a4') });
    // The published 5.236 m³ is rounded (5π/3 m³ by hand derivation): 0.0005 m³ over 3π m² of surface is 0.05 mm.
    expectWithin(allTicks(layout)[1].positionMm, 1000, 0.1);
  });

  it('puts the first mark of a horizontal tank at the published depth (algebra.com question 1106544: 4 ft × 10 ft tank, 41 in of water upright → 17.96 in lying down)', () => {
    const waterL = (Math.PI * (24 * IN) ** 2 * 41 * IN) / 1e6;
    const layout = gaugeStripLayout({ geometry: { shape: 'horizontal-cylinder', diameterMm: 48 * IN, lengthMm: 120 * IN, ends: 'flat' }, datumOffsetMm: 0, everyL: waterL, unitSystem: 'metric' });
    // The published answer rounds its central angle to 2.633 rad, so it is good to about 0.01 in.
    expectWithin(allTicks(layout)[1].positionMm / IN, 17.96, 0.01);
  });

  it('labels a US user’s marks in gallons at the published stick reading (tankvolumecalc.com, "Cone-Bottom Tank volume formula", Worked example: D 48 in, shell 60 in, cone 24 in; 137.9 gal at 33.6 in)', () => {
    const geometry: TankGeometry = { shape: 'cone-bottom', diameterMm: 48 * IN, straightHeightMm: 60 * IN, coneHeightMm: 24 * IN };
    const layout = gaugeStripLayout({ geometry, datumOffsetMm: 0, everyVolume: { value: 137.9, unit: 'usgal' }, unitSystem: 'us', page: gaugePage('letter') });
    const mark = allTicks(layout)[1];
    expect(mark.label).toBe('137.9 gal');
    expect(mark.volumeL).toBeCloseTo(137.9 * GAL, 9);
    // 0.05 gal of rounding over the shell's 7.83 gal/in (hand derivation: π · 24² in² / 231) is 0.006 in.
    expectWithin(mark.positionMm / IN, 33.6, 0.01);
    expect(layout).toMatchObject({ volumeUnit: 'usgal', scaleUnit: 'in' });
  });

  it.each([
    ['metric', { value: 250, unit: 'L' }, 2000, ['0 L', '250 L', '500 L', '750 L', '1,000 L', '1,250 L']],
    ['us', { value: 60, unit: 'usgal' }, 2000, ['0 gal', '60 gal', '120 gal', '180 gal', '240 gal', '300 gal']],
    ['metric', { value: 2.5, unit: 'L' }, 500, ['0 L', '2.5 L', '5 L', '7.5 L', '10 L', '12.5 L']],
  ] as const)('labels marks in the %s unit as typed (%o, %d mm across)', (unitSystem, everyVolume, diameterMm, labels) => {
    const layout = gaugeStripLayout({ geometry: { shape: 'vertical-cylinder', diameterMm, heightMm: 2500 }, datumOffsetMm: 0, everyVolume, unitSystem });
    expect(allTicks(layout).slice(0, 6).map((t) => t.label)).toEqual(labels);
  });

  it('labels litre steps in gallons with 2 decimals for a US user (hand derivation: 10 L = 2.6417 gal)', () => {
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 500 }, datumOffsetMm: 0, everyL: 10, unitSystem: 'us', page: gaugePage('letter') });
    expect(allTicks(layout)[1].label).toBe('2.64 gal');
    expect(allTicks(layout)[1].volume).toBeCloseTo(10 / GAL, 12);
  });

  // Our own rule (no published source): majors on round numbers.
  it.each([
    [50, 2, [0, 100, 200]],
    [25, 4, [0, 100, 200]],
    [10, 5, [0, 50, 100]],
    [20, 5, [0, 100, 200]],
    [0.5, 2, [0, 1, 2]],
  ])('makes marks of a %d L step major every %d steps (%o…)', (everyL, majorEvery, firstMajors) => {
    // 0.2 L per mm of level (hand derivation: 400 mm × 500 mm), so even 0.5 L marks are 2.5 mm apart.
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 400, widthMm: 500, heightMm: 2000 }, datumOffsetMm: 0, everyL, unitSystem: 'metric' });
    expect(layout.majorEvery).toBe(majorEvery);
    const majors = allTicks(layout).filter((t) => t.major).map((t) => t.volume);
    expect(majors.slice(0, 3)).toEqual(firstMajors);
    for (const t of allTicks(layout)) expect(t.major).toBe(Math.round(t.volume / everyL) % majorEvery === 0);
  });

  it('leaves out marks below the tube’s zero mark and starts at the first volume above it', () => {
    const geometry: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 };
    const layout = gaugeStripLayout({ geometry, datumOffsetMm: 100, everyL: 10, unitSystem: 'metric' });
    const ticks = allTicks(layout);
    expect(ticks.every((t) => t.positionMm >= 0)).toBe(true);
    // π/4 · 1 dm² · 1 dm = 78.54 L sit below a zero mark 100 mm up (hand derivation), so the first mark is 80 L.
    expect(ticks[0].volumeL).toBe(80);
    expect(layout.floorPositionMm).toBeNull();
    expect(ticks.at(-1)!.volumeL).toBe(1170);
    expect(ticks.at(-1)!.positionMm).toBeLessThanOrEqual(layout.topPositionMm);
  });

  it('shows the tank floor on the strip when the zero mark is below it', () => {
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 600 }, datumOffsetMm: -40, everyL: 50, unitSystem: 'metric' });
    expect(layout.floorPositionMm).toBe(40);
    expect(allTicks(layout)[0]).toMatchObject({ volumeL: 0, positionMm: 40, label: '0 L' });
  });

  it('keeps the top mark of a tank that holds exactly a whole number of steps', () => {
    // 1 m × 1 m × 0.6 m holds 600 L exactly (hand derivation).
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 600 }, datumOffsetMm: 0, everyL: 50, unitSystem: 'metric' });
    expect(allTicks(layout).at(-1)).toMatchObject({ volumeL: 600, positionMm: 600 });
  });

  it('prints minor labels only where they have room and major labels always', () => {
    // 1 L per mm of level in a 1 m × 1 m box (hand derivation): a 3 L step puts marks 3 mm apart.
    const crowded = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 300 }, datumOffsetMm: 0, everyL: 3, unitSystem: 'metric' });
    expect(3).toBeLessThan(MINOR_LABEL_GAP_MM);
    for (const t of allTicks(crowded)) expect(t.labelShown).toBe(t.major);
    const roomy = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 300 }, datumOffsetMm: 0, everyL: 4, unitSystem: 'metric' });
    expect(allTicks(roomy).every((t) => t.labelShown)).toBe(true);
  });
});

describe('gaugeStripLayout pages', () => {
  const tall: GaugeStripInput = { geometry: { shape: 'vertical-cylinder', diameterMm: 1200, heightMm: 2000 }, datumOffsetMm: 30, everyL: 20, unitSystem: 'metric' };

  it('tiles A4 pages of 297 − 2·10 − 48 mm bottom up and covers the strip with no gap or overlap', () => {
    const layout = gaugeStripLayout(tall);
    const stripMm = 297 - 2 * 10 - GAUGE_HEADER_MM;
    expect(layout.page).toEqual({ widthMm: 210, heightMm: 297, marginMm: 10 });
    expect(layout.stripHeightMm).toBe(stripMm);
    expect(layout.totalPages).toBe(Math.ceil(1970 / stripMm));
    expect(layout.pages[0].fromMm).toBe(0);
    expect(layout.pages.at(-1)!.toMm).toBe(1970);
    layout.pages.forEach((p, i) => {
      expect(p.index).toBe(i);
      expect(p.label).toBe(`${i + 1} of ${layout.totalPages}`);
      if (i > 0) expect(p.fromMm).toBe(layout.pages[i - 1].toMm);
      if (i < layout.totalPages - 1) expect(p.toMm - p.fromMm).toBeCloseTo(stripMm, 9);
    });
  });

  it('puts every mark on exactly one page, inside that page’s range', () => {
    const layout = gaugeStripLayout(tall);
    const want = expectedPositions(uprightCylinder(1200, 2000), tall.datumOffsetMm, 20);
    expect(allTicks(layout).map((t) => t.volumeL)).toEqual(want.map((w) => w.k * 20));
    for (const p of layout.pages) {
      const last = p.index === layout.totalPages - 1;
      for (const t of p.ticks) {
        expect(t.positionMm).toBeGreaterThanOrEqual(p.fromMm);
        expect(last ? t.positionMm <= p.toMm : t.positionMm < p.toMm).toBe(true);
      }
    }
  });

  it('gives a mark that falls exactly on a join to the upper page only', () => {
    // 1 L per mm in a 1 m × 1 m box (hand derivation): a 229 L step lands every mark on a join.
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 700 }, datumOffsetMm: 0, everyL: 229, unitSystem: 'metric' });
    expect(layout.stripHeightMm).toBe(229);
    expect(layout.pages.map((p) => p.ticks.map((t) => t.positionMm))).toEqual([[0], [229], [458], [687]]);
  });

  it('marks each join on both pages with the same number at the same tube position', () => {
    const layout = gaugeStripLayout(tall);
    expect(layout.pages[0].joins).toEqual([{ positionMm: layout.pages[0].toMm, join: 1, role: 'cut', otherPage: 2, text: 'Join 1: cut here — page 2 continues here' }]);
    for (let i = 0; i < layout.totalPages - 1; i++) {
      const cut = layout.pages[i].joins.find((j) => j.role === 'cut')!;
      const match = layout.pages[i + 1].joins.find((j) => j.role === 'match')!;
      expect(cut.positionMm).toBe(match.positionMm);
      expect(cut.join).toBe(match.join);
      expect(match.text).toContain(`page ${i + 1}`);
    }
    expect(layout.pages.at(-1)!.joins.map((j) => j.role)).toEqual(['match']);
  });

  it('prints the same edge-scale mark on both sides of a join, so the two pages can be checked against each other', () => {
    const layout = gaugeStripLayout(tall);
    const top = layout.pages[0].scale.at(-1)!;
    const bottom = layout.pages[1].scale[0];
    expect(top.positionMm).toBe(bottom.positionMm);
  });

  it('lays a one-page strip for a short tank', () => {
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 400, widthMm: 300, heightMm: 200 }, datumOffsetMm: 0, everyL: 1, unitSystem: 'metric' });
    expect(layout.totalPages).toBe(1);
    expect(layout.pages[0].joins).toEqual([]);
  });

  it('uses US Letter, 8.5 × 11 in, when asked', () => {
    const layout = gaugeStripLayout({ ...tall, page: gaugePage('letter') });
    expect(layout.page.widthMm).toBeCloseTo(8.5 * IN, 12);
    expect(layout.stripHeightMm).toBeCloseTo(11 * IN - 20 - GAUGE_HEADER_MM, 12);
  });
});

describe('gaugeStripLayout edge scale', () => {
  it('marks every millimetre, every 5th medium, every 10th large and labelled in mm', () => {
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 400, widthMm: 300, heightMm: 120 }, datumOffsetMm: 0, everyL: 1, unitSystem: 'metric' });
    const scale = layout.pages[0].scale;
    expect(scale).toHaveLength(121);
    expect(scale.slice(9, 12)).toEqual([
      { positionMm: 9, size: 'small', label: null },
      { positionMm: 10, size: 'large', label: '10' },
      { positionMm: 11, size: 'small', label: null },
    ]);
    expect(scale[15]).toEqual({ positionMm: 15, size: 'medium', label: null });
  });

  it('marks every tenth of an inch (2.54 mm) for US users and labels whole inches', () => {
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 400, widthMm: 300, heightMm: 120 }, datumOffsetMm: 0, everyVolume: { value: 1, unit: 'usgal' }, unitSystem: 'us', page: gaugePage('letter') });
    const scale = layout.pages[0].scale;
    // 120 mm / 2.54 mm = 47.2 tenths (hand derivation): marks 0 … 47.
    expect(scale).toHaveLength(48);
    expect(scale[10]).toEqual({ positionMm: IN, size: 'large', label: '1' });
    expect(scale[25].positionMm).toBeCloseTo(2.5 * IN, 12);
    expect(scale[25].size).toBe('medium');
  });
});

describe('gaugeStripLayout refusals', () => {
  const cylinder: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 2000, heightMm: 2000 };

  it.each([0, -5, Number.NaN, Number.POSITIVE_INFINITY])('refuses a step of %d L, naming everyL', (everyL) => {
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyL, unitSystem: 'metric' })).toThrow(/^everyL: the step between marks must be a number greater than 0/);
  });

  it('refuses a step in gallons of 0, naming everyVolume.value', () => {
    const run = () => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyVolume: { value: 0, unit: 'usgal' }, unitSystem: 'us' });
    expect(run).toThrow(GaugeStripError);
    expect(run).toThrow(/^everyVolume\.value:/);
  });

  it('refuses both or neither of everyL and everyVolume', () => {
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, unitSystem: 'metric' })).toThrow(/exactly one of everyL or everyVolume/);
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyL: 10, everyVolume: { value: 10, unit: 'L' }, unitSystem: 'metric' })).toThrow(/exactly one/);
  });

  it('refuses marks closer than 2 mm on average and says how close they would be', () => {
    // π · 1 m² holds 3.1416 L per mm (hand derivation): 5 L marks are 1.59 mm apart, 6.3 L ones 2.005 mm.
    const run = (everyL: number) => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyL, unitSystem: 'metric' });
    expect(() => run(5)).toThrow(RangeError);
    expect(() => run(5)).toThrow(/^everyL: a mark every 5 L puts about 1,257 marks on this 2,000 mm strip, 1\.59 mm apart on average; marks must be at least 2 mm apart to read — use 10 L or more$/);
    expect(() => run(6.2)).toThrow(/1\.97 mm apart/);
    expect(MIN_TICK_GAP_MM).toBe(2);
    expect(run(6.3).tickCount).toBeGreaterThan(900);
  });

  it('names where a horizontal tank crowds its marks: the middle, where it is widest', () => {
    // 1 m × 2 m flat-ended: 2 L per mm at mid-height (hand derivation), so 3.5 L marks are 1.75 mm apart
    // there, though 2.24 mm apart on average (1,571 L over 1,000 mm).
    const run = () => gaugeStripLayout({ geometry: { shape: 'horizontal-cylinder', diameterMm: 1000, lengthMm: 2000, ends: 'flat' }, datumOffsetMm: 0, everyL: 3.5, unitSystem: 'metric' });
    expect(run).toThrow(/^everyL: a mark every 3\.5 L puts two marks only 1\.75 mm apart \(near (49\d|50\d) mm on the tube\); .* use 5 L or more$/);
  });

  it('refuses a tiny step fast, with the average spacing, before solving any level', () => {
    const started = Date.now();
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyL: 0.0001, unitSystem: 'metric' })).toThrow(/about 62,831,854 marks on this 2,000 mm strip/);
    expect(Date.now() - started).toBeLessThan(1000);
  });

  it('refuses a strip of more than 100 pages', () => {
    // 30 m / 229 mm per A4 page = 131 pages (hand derivation).
    const run = () => gaugeStripLayout({ geometry: { shape: 'vertical-cylinder', diameterMm: 3000, heightMm: 30_000 }, datumOffsetMm: 0, everyL: 1000, unitSystem: 'metric' });
    expect(run).toThrow(new RegExp(`^page: this 30,000 mm strip needs 132 pages of 229 mm; at most ${MAX_GAUGE_PAGES} pages`));
  });

  it('refuses a tube zero mark at or above the top of the tank', () => {
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 2000, everyL: 10, unitSystem: 'metric' })).toThrow(/^datumOffsetMm: the tube's zero mark \(2,000 mm above the floor\) is at or above the top/);
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: Number.NaN, everyL: 10, unitSystem: 'metric' })).toThrow(/^datumOffsetMm: must be a finite number/);
  });

  it('refuses a page too small for the strip, naming the page field', () => {
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyL: 10, unitSystem: 'metric', page: { widthMm: 210, heightMm: 148, marginMm: 10 } })).toThrow(/^page\.heightMm: leaves 80 mm for the strip/);
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyL: 10, unitSystem: 'metric', page: { widthMm: 105, heightMm: 297, marginMm: 10 } })).toThrow(/^page\.widthMm:/);
    expect(() => gaugeStripLayout({ geometry: cylinder, datumOffsetMm: 0, everyL: 10, unitSystem: 'metric', page: { widthMm: 210, heightMm: 297, marginMm: -1 } })).toThrow(/^page\.marginMm:/);
  });

  it('passes on the geometry’s own error for an invalid tank', () => {
    expect(() => gaugeStripLayout({ geometry: { shape: 'vertical-cylinder', diameterMm: -1, heightMm: 100 }, datumOffsetMm: 0, everyL: 10, unitSystem: 'metric' })).toThrow(/diameterMm/);
  });
});

describe('suggestGaugeStep', () => {
  const ibc: TankGeometry = { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1000 };

  it.each([
    // 1.2 L per mm (hand derivation): 5 L is 4.17 mm, 10 L is 8.33 mm.
    ['metric', { value: 10, unit: 'L' }],
    // 1.2 L/mm = 0.317 gal per mm (hand derivation): 1 gal is 3.15 mm, 2 gal is 6.31 mm.
    ['us', { value: 2, unit: 'usgal' }],
  ] as const)('gives the smallest round step with marks 5 mm apart for an IBC tote (%s)', (unitSystem, want) => {
    expect(suggestGaugeStep(ibc, 0, unitSystem)).toEqual(want);
  });

  it.each(SHAPES)('gives a step the layout accepts with marks at least 5 mm apart for a %s', (_name, geometry, datumOffsetMm) => {
    const step = suggestGaugeStep(geometry, datumOffsetMm, 'metric');
    const ticks = allTicks(gaugeStripLayout({ geometry, datumOffsetMm, everyVolume: step, unitSystem: 'metric' }));
    for (let i = 1; i < ticks.length; i++) expect(ticks[i].positionMm - ticks[i - 1].positionMm).toBeGreaterThanOrEqual(SUGGESTED_TICK_GAP_MM);
    expect([1, 2, 2.5, 5]).toContain(Number((step.value / 10 ** Math.floor(Math.log10(step.value))).toPrecision(6)));
  });

  it('refuses a zero mark above the tank as the layout does', () => {
    expect(() => suggestGaugeStep(ibc, 1200, 'metric')).toThrow(/^datumOffsetMm:/);
  });
});
