import { finiteNumber, nonNegative } from '../checks';

/** One reading of a tank's contents. */
export interface LevelReading {
  /** When it was read (epoch ms). */
  takenAt: number;
  /** Volume in the tank at that moment (L). */
  volumeL: number;
}

/** How a stretch of a level series is classified. */
export type MovementKind = 'refill' | 'use' | 'steady';

/** A stretch of a level series with one kind of movement. */
export interface LevelMovement {
  kind: MovementKind;
  /** Start (epoch ms). */
  from: number;
  /** End (epoch ms). */
  to: number;
  /** Level the stretch starts from (L): the dead-band reference level. */
  fromL: number;
  /** Level it ends at (L); equal to fromL for a steady stretch. */
  toL: number;
  /** toL − fromL (L): positive for a refill, negative for use, 0 when steady. */
  changeL: number;
}

/** Readings sorted by time, one per instant (times strictly increasing). */
export interface PreparedSeries {
  /** Reading times (epoch ms). */
  t: number[];
  /** Volumes (L). */
  v: number[];
}

/** Milliseconds in one hour (ms). */
export const MS_PER_HOUR = 3_600_000;
/** Milliseconds in one day (ms). */
export const MS_PER_DAY = 86_400_000;

/**
 * Checked readings sorted by time (ms, L); readings sharing one instant are replaced by their mean,
 * since a manual reading and a logger sample at the same moment describe one level.
 */
export function prepareSeries(series: readonly LevelReading[]): PreparedSeries {
  if (!Array.isArray(series)) throw new RangeError('series must be an array of readings');
  const rows = series.map((r, i) => ({
    takenAt: finiteNumber(`series[${i}].takenAt`, r?.takenAt),
    volumeL: nonNegative(`series[${i}].volumeL`, r?.volumeL),
  }));
  // Ties broken by volume so the result, including the mean's rounding, does not depend on input order.
  rows.sort((a, b) => a.takenAt - b.takenAt || a.volumeL - b.volumeL);
  const t: number[] = [];
  const v: number[] = [];
  for (let i = 0; i < rows.length; ) {
    let j = i;
    let sum = 0;
    while (j < rows.length && rows[j].takenAt === rows[i].takenAt) sum += rows[j++].volumeL;
    t.push(rows[i].takenAt);
    v.push(sum / (j - i));
    i = j;
  }
  return { t, v };
}

/**
 * Dead-band (hysteresis) segmentation of prepared readings into movements (ms, L), not merged.
 *
 * A reference level is held until a reading differs from it by more than `noiseL`; jitter inside the
 * band therefore never registers, however many readings there are. When a change registers, it is
 * measured from the reference level (so changes add up to the true net change) and placed on the
 * last strictly monotone run of readings leading to it: that is where the level was visibly moving,
 * while the readings before it were still at the reference within the band.
 */
export function deadBandMovements(prepared: PreparedSeries, noiseL: number): LevelMovement[] {
  const { t, v } = prepared;
  const out: LevelMovement[] = [];
  if (t.length < 2) return out;
  let ref = 0;
  for (let i = 1; i < t.length; i++) {
    const changeL = v[i] - v[ref];
    if (Math.abs(changeL) <= noiseL) continue;
    const rising = changeL > 0;
    let start = i - 1;
    while (start > ref && (rising ? v[start - 1] < v[start] : v[start - 1] > v[start])) start--;
    if (start > ref) out.push(steady(t[ref], t[start], v[ref]));
    out.push({ kind: rising ? 'refill' : 'use', from: t[start], to: t[i], fromL: v[ref], toL: v[i], changeL });
    ref = i;
  }
  if (ref < t.length - 1) out.push(steady(t[ref], t[t.length - 1], v[ref]));
  return out;
}

function steady(from: number, to: number, levelL: number): LevelMovement {
  return { kind: 'steady', from, to, fromL: levelL, toL: levelL, changeL: 0 };
}
