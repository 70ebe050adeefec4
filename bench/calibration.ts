// Calibration bench: time to build a 1 mm table for a 3 m tall tank, and table lookups per second.
// Run: node --import tsx bench/calibration.ts
import { pathToFileURL } from 'node:url';
import { buildCalibrationTable, lookupVolume, type TankGeometry } from '../shared/calibration/index';

/** One measured figure against its target. */
export interface BenchFigure {
  name: string;
  value: number;
  unit: string;
  target: number;
  /** 'below': pass when value < target; 'above': pass when value > target. */
  pass: 'below' | 'above';
  ok: boolean;
}

const TABLE_TARGET_MS = 5;
const LOOKUP_TARGET_PER_S = 5_000_000;
const LOOKUPS = 1_000_000;

// 3 m tall tanks: a plain upright water tank and the costliest closed form (horizontal shell, 2:1 heads).
const TANKS: { label: string; geometry: TankGeometry }[] = [
  { label: 'vertical cylinder 2.4 m × 3 m', geometry: { shape: 'vertical-cylinder', diameterMm: 2400, heightMm: 3000 } },
  {
    label: 'horizontal cylinder 3 m × 6 m, 2:1 heads',
    geometry: { shape: 'horizontal-cylinder', diameterMm: 3000, lengthMm: 6000, ends: 'ellipsoidal-2to1' },
  },
];

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/** Runs the bench and returns each figure (table build in ms, lookups per second) with its target and verdict. */
export function runCalibrationBench(runs = 21): BenchFigure[] {
  const figures: BenchFigure[] = [];
  for (const { label, geometry } of TANKS) {
    buildCalibrationTable(geometry, 1); // warm-up so the JIT has compiled the closed form
    const times: number[] = [];
    for (let r = 0; r < runs; r++) {
      const t0 = performance.now();
      buildCalibrationTable(geometry, 1);
      times.push(performance.now() - t0);
    }
    const ms = median(times);
    figures.push({ name: `1 mm table, ${label} (median of ${runs})`, value: ms, unit: 'ms', target: TABLE_TARGET_MS, pass: 'below', ok: ms < TABLE_TARGET_MS });
  }

  const table = buildCalibrationTable(TANKS[1].geometry, 1);
  const top = table[table.length - 1].levelMm;
  // Levels fixed in advance by a small LCG so the timed loop does nothing but look up.
  const levels = new Float64Array(LOOKUPS);
  let seed = 12345;
  for (let i = 0; i < LOOKUPS; i++) {
    seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
    levels[i] = (seed / 2 ** 32) * top;
  }
  let sink = 0;
  for (let i = 0; i < 100_000; i++) sink += lookupVolume(table, levels[i]);
  const rates: number[] = [];
  for (let r = 0; r < 5; r++) {
    const t0 = performance.now();
    for (let i = 0; i < LOOKUPS; i++) sink += lookupVolume(table, levels[i]);
    rates.push(LOOKUPS / ((performance.now() - t0) / 1000));
  }
  // Using the sum keeps the optimiser from dropping the loop.
  if (!Number.isFinite(sink)) throw new Error('lookup produced a non-finite volume');
  const rate = median(rates);
  figures.push({
    name: `lookups on a ${table.length.toLocaleString('en-US')}-row table (${LOOKUPS.toLocaleString('en-US')} per run, median of 5)`,
    value: rate,
    unit: 'lookups/s',
    target: LOOKUP_TARGET_PER_S,
    pass: 'above',
    ok: rate > LOOKUP_TARGET_PER_S,
  });
  return figures;
}

function show(f: BenchFigure): string {
  const value = f.unit === 'ms' ? f.value.toFixed(3) : Math.round(f.value).toLocaleString('en-US');
  const target = f.unit === 'ms' ? String(f.target) : f.target.toLocaleString('en-US');
  return `${f.name}: figure ${value} ${f.unit} target ${f.pass === 'below' ? '<' : '>'} ${target} ${f.unit} ${f.ok ? 'PASS' : 'MISS'}`;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const f of runCalibrationBench()) console.log(show(f));
}
