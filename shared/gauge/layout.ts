// The gauge strip: where each volume mark sits on the sight tube, and how a tall strip is tiled over pages.
//
// Positions are millimetres on the tube's own scale: 0 is the tube's zero mark, which sits
// `datumOffsetMm` above the tank floor, so a mark for volume V sits at levelAtVolume(V) − datumOffsetMm.
import { tankModel, type TankGeometry, type TankModel } from '../calibration/index';
import {
  displayUnits,
  formatNumberTrimmed,
  fromSI,
  INCH_MM,
  toSI,
  UNIT_SYMBOLS,
  VOLUME_UNITS,
  type UnitSystem,
  type VolumeUnit,
} from '../units/index';
import { checkProblem, figure, type CheckParam, type CheckProblem } from '../check-problems';
import { GAUGE_HEADER_MM, gaugePage, MIN_GAUGE_CONTENT_WIDTH_MM, MIN_GAUGE_STRIP_HEIGHT_MM, type GaugePage } from './paper';
import type { GaugeJoin, GaugeScaleMark, GaugeStripInput, GaugeStripLayout, GaugeStripPage, GaugeTick } from './types';

export type { GaugeJoin, GaugeScaleMark, GaugeStripInput, GaugeStripLayout, GaugeStripPage, GaugeTick } from './types';

/** Closest two volume marks may sit, in mm: closer than this a printed mark cannot be told from the next. */
export const MIN_TICK_GAP_MM = 2;
/** Gap in mm a minor mark needs on both sides before its label is printed (6 pt text is about 2 mm tall). */
export const MINOR_LABEL_GAP_MM = 3.5;
/** Gap in mm between marks that `suggestGaugeStep` aims for: easy to read at arm's length. */
export const SUGGESTED_TICK_GAP_MM = 5;
/** Most pages one strip may take. */
export const MAX_GAUGE_PAGES = 100;

/**
 * A bad gauge-strip request; `field` names the input at fault ("everyL", "datumOffsetMm", "page.heightMm"…),
 * the message is English and `problem` says the same after the field as a code of area `checks` ("gauge.tooClose").
 */
export class GaugeStripError extends RangeError {
  readonly field: string;
  readonly problem: CheckProblem;
  constructor(field: string, message: string, problem: CheckProblem) {
    super(`${field}: ${message}`);
    this.name = 'GaugeStripError';
    this.field = field;
    this.problem = problem;
  }
}

interface Step {
  value: number;
  unit: VolumeUnit;
  field: string;
}

interface Placed {
  k: number;
  positionMm: number;
  levelMm: number;
  volumeL: number;
}

type Placement = { ok: true; ticks: Placed[] } | { ok: false; message: string; code: string; params: Record<string, CheckParam>; suggestion: number };

const num = (v: number, digits = 3) => formatNumberTrimmed(v, digits);

/**
 * The gauge strip for a tank: a mark every step of volume at levelAtVolume(k·step) − datumOffsetMm
 * on the tube (marks below the tube's zero mark or above the top of the tank left out), labelled in
 * the user's volume unit, with a length scale in mm (or 0.1 in) and pages of `page` tiled bottom up.
 * Throws GaugeStripError naming the field for a step ≤ 0, marks closer than 2 mm, a zero mark at or
 * above the top of the tank, a page too small, or more than 100 pages.
 */
export function gaugeStripLayout(input: GaugeStripInput): GaugeStripLayout {
  const step = stepOf(input);
  const page = checkedPage(input.page ?? gaugePage('a4'));
  const model = tankModel(input.geometry);
  const datumOffsetMm = input.datumOffsetMm;
  const topPositionMm = checkedTop(model, datumOffsetMm);
  const stripHeightMm = page.heightMm - 2 * page.marginMm - GAUGE_HEADER_MM;
  // A strip that ends a hair past a page boundary should not get a page of its own.
  const totalPages = Math.max(1, Math.ceil(topPositionMm / stripHeightMm - 1e-9));
  if (totalPages > MAX_GAUGE_PAGES) {
    throw new GaugeStripError(
      'page',
      `this ${num(topPositionMm, 0)} mm strip needs ${totalPages} pages of ${num(stripHeightMm, 1)} mm; at most ${MAX_GAUGE_PAGES} pages are printed`,
      checkProblem('gauge.tooManyPages', { length: figure(topPositionMm, 0), pages: String(totalPages), height: figure(stripHeightMm, 1), max: String(MAX_GAUGE_PAGES) }),
    );
  }

  const placement = placeTicks(model, datumOffsetMm, topPositionMm, step, MIN_TICK_GAP_MM);
  if (!placement.ok) {
    throw new GaugeStripError(
      step.field,
      `${placement.message}; marks must be at least ${MIN_TICK_GAP_MM} mm apart to read — use ${num(placement.suggestion, 6)} ${UNIT_SYMBOLS[step.unit]} or more`,
      checkProblem(placement.code, { ...placement.params, gap: String(MIN_TICK_GAP_MM), suggestion: figure(placement.suggestion, 6) }),
    );
  }

  const volumeUnit = displayUnits(input.unitSystem).volume;
  const scaleUnit = displayUnits(input.unitSystem).length;
  const majorEvery = majorEveryFor(step.value);
  const stepInLabelUnit = fromSI(toSI(step.value, step.unit), volumeUnit);
  // A step typed in another unit than the labels' rarely converts to round numbers: show 2 decimals then.
  const labelDigits = step.unit === volumeUnit ? (decimalsOf(step.value) ?? 3) : (decimalsOf(stepInLabelUnit) ?? 2);
  const placed = placement.ticks;
  const ticks: GaugeTick[] = placed.map((t, i) => {
    const volume = step.unit === volumeUnit ? t.k * step.value : fromSI(t.volumeL, volumeUnit);
    const major = t.k % majorEvery === 0;
    const below = i > 0 ? t.positionMm - placed[i - 1].positionMm : Infinity;
    const above = i < placed.length - 1 ? placed[i + 1].positionMm - t.positionMm : Infinity;
    return {
      positionMm: t.positionMm,
      levelMm: t.levelMm,
      volumeL: t.volumeL,
      volume,
      label: `${num(volume, labelDigits)} ${UNIT_SYMBOLS[volumeUnit]}`,
      major,
      labelShown: major || (below >= MINOR_LABEL_GAP_MM && above >= MINOR_LABEL_GAP_MM),
    };
  });

  const pages: GaugeStripPage[] = [];
  let next = 0;
  for (let index = 0; index < totalPages; index++) {
    const last = index === totalPages - 1;
    const fromMm = index * stripHeightMm;
    const toMm = last ? topPositionMm : (index + 1) * stripHeightMm;
    const onPage: GaugeTick[] = [];
    // Half-open ranges give a mark exactly on a join to the upper page only.
    while (next < ticks.length && (last || ticks[next].positionMm < toMm)) onPage.push(ticks[next++]);
    const joins: GaugeJoin[] = [];
    if (index > 0) joins.push({ positionMm: fromMm, join: index, role: 'match', otherPage: index, text: `Join ${index}: lay the cut top edge of page ${index} on this line` });
    if (!last) joins.push({ positionMm: toMm, join: index + 1, role: 'cut', otherPage: index + 2, text: `Join ${index + 1}: cut here — page ${index + 2} continues here` });
    pages.push({ index, label: `${index + 1} of ${totalPages}`, fromMm, toMm, ticks: onPage, scale: scaleMarks(fromMm, toMm, scaleUnit), joins });
  }

  return {
    pages,
    totalPages,
    page,
    stripHeightMm,
    stripBottomMm: page.marginMm,
    topPositionMm,
    floorPositionMm: datumOffsetMm < 0 ? -datumOffsetMm : null,
    datumOffsetMm,
    step: { value: step.value, unit: step.unit },
    stepL: toSI(step.value, step.unit),
    volumeUnit,
    scaleUnit,
    majorEvery,
    tickCount: ticks.length,
  };
}

/**
 * The smallest round step (1, 2, 2.5 or 5 × 10ⁿ) in the user's volume unit (L or US gal) that keeps
 * every mark of this tank's strip at least 5 mm from the next; throws GaugeStripError when the tube's
 * zero mark is at or above the top of the tank.
 */
export function suggestGaugeStep(geometry: TankGeometry, datumOffsetMm: number, unitSystem: UnitSystem): { value: number; unit: 'L' | 'usgal' } {
  const model = tankModel(geometry);
  const topPositionMm = checkedTop(model, datumOffsetMm);
  const unit = displayUnits(unitSystem).volume;
  const capacity = fromSI(model.capacityL, unit);
  // Start where the average spacing would be right; the narrowest part of the tank may need more.
  let value = niceCeil((capacity * SUGGESTED_TICK_GAP_MM) / topPositionMm);
  for (let i = 0; i < 60; i++) {
    const placement = placeTicks(model, datumOffsetMm, topPositionMm, { value, unit, field: 'every' }, SUGGESTED_TICK_GAP_MM);
    if (placement.ok) return { value, unit };
    value = niceAbove(value);
  }
  return { value: niceCeil(capacity), unit };
}

function stepOf(input: GaugeStripInput): Step {
  const { everyL, everyVolume } = input;
  if ((everyL === undefined) === (everyVolume === undefined)) {
    throw new GaugeStripError('everyL', 'give exactly one of everyL or everyVolume', checkProblem('gauge.oneStep'));
  }
  const step: Step = everyVolume ? { value: everyVolume.value, unit: everyVolume.unit, field: 'everyVolume.value' } : { value: everyL as number, unit: 'L', field: 'everyL' };
  if (!(VOLUME_UNITS as readonly string[]).includes(step.unit)) {
    throw new GaugeStripError('everyVolume.unit', `must be one of ${VOLUME_UNITS.join(', ')} (got ${String(step.unit)})`, checkProblem('gauge.unit', { units: VOLUME_UNITS.join(', '), got: String(step.unit) }));
  }
  if (typeof step.value !== 'number' || !Number.isFinite(step.value) || step.value <= 0) {
    throw new GaugeStripError(step.field, `the step between marks must be a number greater than 0 (got ${String(step.value)})`, checkProblem('gauge.stepNotPositive', { got: String(step.value) }));
  }
  return step;
}

function checkedPage(page: GaugePage): GaugePage {
  for (const key of ['widthMm', 'heightMm', 'marginMm'] as const) {
    const v = page[key];
    if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || (key !== 'marginMm' && v === 0)) {
      throw new GaugeStripError(
        `page.${key}`,
        `must be a number of mm ${key === 'marginMm' ? '0 or more' : 'greater than 0'} (got ${String(v)})`,
        checkProblem(key === 'marginMm' ? 'gauge.pageNotNegative' : 'gauge.pageNotPositive', { got: String(v) }),
      );
    }
  }
  const contentWidthMm = page.widthMm - 2 * page.marginMm;
  if (contentWidthMm < MIN_GAUGE_CONTENT_WIDTH_MM) {
    throw new GaugeStripError(
      'page.widthMm',
      `leaves ${num(contentWidthMm, 1)} mm inside the margins; the strip and its notes need ${MIN_GAUGE_CONTENT_WIDTH_MM} mm`,
      checkProblem('gauge.tooNarrow', { width: figure(contentWidthMm, 1), min: String(MIN_GAUGE_CONTENT_WIDTH_MM) }),
    );
  }
  const stripHeightMm = page.heightMm - 2 * page.marginMm - GAUGE_HEADER_MM;
  if (stripHeightMm < MIN_GAUGE_STRIP_HEIGHT_MM) {
    throw new GaugeStripError(
      'page.heightMm',
      `leaves ${num(stripHeightMm, 1)} mm for the strip after the margins and the ${GAUGE_HEADER_MM} mm header; at least ${MIN_GAUGE_STRIP_HEIGHT_MM} mm is needed`,
      checkProblem('gauge.tooShort', { height: figure(stripHeightMm, 1), header: String(GAUGE_HEADER_MM), min: String(MIN_GAUGE_STRIP_HEIGHT_MM) }),
    );
  }
  return { widthMm: page.widthMm, heightMm: page.heightMm, marginMm: page.marginMm };
}

/** Tube position of the top of the tank, mm; refuses a zero mark that leaves nothing to mark. */
function checkedTop(model: TankModel, datumOffsetMm: number): number {
  if (typeof datumOffsetMm !== 'number' || !Number.isFinite(datumOffsetMm)) {
    throw new GaugeStripError('datumOffsetMm', `must be a finite number of mm (got ${String(datumOffsetMm)})`, checkProblem('gauge.datumNotNumber', { got: String(datumOffsetMm) }));
  }
  const top = model.heightMm - datumOffsetMm;
  if (top <= 0) {
    throw new GaugeStripError(
      'datumOffsetMm',
      `the tube's zero mark (${num(datumOffsetMm, 1)} mm above the floor) is at or above the top of the tank (${num(model.heightMm, 1)} mm); there is nothing to mark`,
      checkProblem('gauge.nothingToMark', { datum: figure(datumOffsetMm, 1), top: figure(model.heightMm, 1) }),
    );
  }
  return top;
}

/**
 * Marks k·step for every k whose level lies on the strip (tube position 0..top), by the same level
 * solver levelAtVolume uses; refuses (without throwing) when two kept marks would be closer than `minGapMm`.
 */
function placeTicks(model: TankModel, datumOffsetMm: number, topPositionMm: number, step: Step, minGapMm: number): Placement {
  const capacityL = model.capacityL;
  const stepL = toSI(step.value, step.unit);
  const stepText = `${num(step.value, 6)} ${UNIT_SYMBOLS[step.unit]}`;
  const lowestLevelMm = Math.min(model.heightMm, Math.max(0, datumOffsetMm));
  // One step below the first candidate: rounding may put k·step a hair under the zero mark's volume.
  const kFirst = Math.max(0, Math.ceil(model.volumeL(lowestLevelMm) / stepL) - 1);
  const kLast = Math.floor(capacityL / stepL + 1e-9);
  const count = kLast - kFirst + 1;
  // n marks on a strip of length top are closer than top/(n−1) somewhere: refuse before solving levels.
  if (count - 1 > topPositionMm / minGapMm + 1) {
    const averageMm = topPositionMm / Math.max(1, count - 1);
    return {
      ok: false,
      message: `a mark every ${stepText} puts about ${num(count, 0)} marks on this ${num(topPositionMm, 0)} mm strip, ${num(averageMm, 2)} mm apart on average`,
      code: 'gauge.tooCrowded',
      params: { step: figure(step.value, 6), unit: UNIT_SYMBOLS[step.unit], count: figure(count, 0), length: figure(topPositionMm, 0), average: figure(averageMm, 2) },
      suggestion: niceCeil((step.value * minGapMm) / averageMm),
    };
  }
  // Same slack as levelAtVolume: the top mark of a tank that holds exactly k·step must not be lost to rounding.
  const slackL = 1e-12 * Math.max(1, capacityL);
  const ticks: Placed[] = [];
  for (let k = kFirst; k <= kLast; k++) {
    const volumeL = toSI(k * step.value, step.unit);
    if (volumeL > capacityL + slackL) continue;
    const levelMm = model.levelMm(Math.min(capacityL, volumeL));
    let positionMm = levelMm - datumOffsetMm;
    if (positionMm < -1e-9) continue;
    if (positionMm < 0) positionMm = 0;
    ticks.push({ k, positionMm, levelMm, volumeL });
  }
  let closest = Infinity;
  let at = 0;
  for (let i = 1; i < ticks.length; i++) {
    const gap = ticks[i].positionMm - ticks[i - 1].positionMm;
    if (gap < closest) {
      closest = gap;
      at = (ticks[i].positionMm + ticks[i - 1].positionMm) / 2;
    }
  }
  if (closest < minGapMm) {
    return {
      ok: false,
      message: `a mark every ${stepText} puts two marks only ${num(closest, 2)} mm apart (near ${num(at, 0)} mm on the tube)`,
      code: 'gauge.tooClose',
      params: { step: figure(step.value, 6), unit: UNIT_SYMBOLS[step.unit], closest: figure(closest, 2), at: figure(at, 0) },
      suggestion: niceCeil((step.value * minGapMm) / Math.max(closest, 1e-9)),
    };
  }
  return { ok: true, ticks };
}

/** Edge-scale marks on [fromMm, toMm]: every mm (metric) or every 0.1 in (US), both ends included. */
function scaleMarks(fromMm: number, toMm: number, unit: 'mm' | 'in'): GaugeScaleMark[] {
  // Whole pitches: mm for metric, tenths of an inch for US (decimal inches, as tube readings are typed).
  const perMm = unit === 'mm' ? 1 : 10 / INCH_MM;
  const marks: GaugeScaleMark[] = [];
  const first = Math.ceil(fromMm * perMm - 1e-9);
  const last = Math.floor(toMm * perMm + 1e-9);
  for (let j = first; j <= last; j++) {
    const size = j % 10 === 0 ? 'large' : j % 5 === 0 ? 'medium' : 'small';
    const positionMm = unit === 'mm' ? j : (j * INCH_MM) / 10;
    marks.push({ positionMm, size, label: size === 'large' ? String(unit === 'mm' ? j : j / 10) : null });
  }
  return marks;
}

/**
 * Every how many steps a major mark falls, chosen so majors land on round numbers: every 4th for
 * steps of 2.5·10ⁿ (25 → 100), every 2nd for 5·10ⁿ (50 → 100), else every 5th (10 → 50, 20 → 100).
 * Our own rule, no published source.
 */
function majorEveryFor(step: number): number {
  const m = mantissa(step);
  if (Math.abs(m - 2.5) < 1e-9) return 4;
  if (Math.abs(m - 5) < 1e-9) return 2;
  return 5;
}

/** `x` = m · 10ⁿ with 1 ≤ m < 10. */
function mantissa(x: number): number {
  let e = Math.floor(Math.log10(x));
  let m = x / 10 ** e;
  if (m >= 10 - 1e-9) {
    e += 1;
    m = x / 10 ** e;
  }
  if (m < 1 - 1e-9) m *= 10;
  return m;
}

const NICE = [1, 2, 2.5, 5, 10];

/** Smallest 1, 2, 2.5 or 5 × 10ⁿ at or above `x`. */
function niceCeil(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return 1;
  const e = Math.floor(Math.log10(x));
  const base = 10 ** e;
  for (const n of NICE) {
    const v = roundTidy(n * base);
    if (v >= x * (1 - 1e-12)) return v;
  }
  return roundTidy(10 * base);
}

/** The round step after `x` (x itself a 1, 2, 2.5 or 5 × 10ⁿ). */
function niceAbove(x: number): number {
  return niceCeil(x * (1 + 1e-9));
}

/** Strips binary noise so 0.1 · 3 prints as 0.3. */
function roundTidy(v: number): number {
  return Number(v.toPrecision(12));
}

/** How many decimals (0–3) write `x` exactly, or null when 3 are not enough. */
function decimalsOf(x: number): number | null {
  for (let d = 0; d <= 3; d++) {
    const scaled = x * 10 ** d;
    if (Math.abs(scaled - Math.round(scaled)) < 1e-9 * Math.max(1, Math.abs(scaled))) return d;
  }
  return null;
}
