// The gauge strip's shapes: what is asked for and what a renderer is given (lengths in mm, volumes in L).
import type { TankGeometry } from '../calibration/index';
import type { UnitSystem, VolumeUnit } from '../units/index';
import type { GaugePage } from './paper';

/** What to lay out: the tank, where the tube's zero mark is, the volume step and the paper (mm, L). */
export interface GaugeStripInput {
  geometry: TankGeometry;
  /** Height of the sight tube's zero mark above the tank floor, mm (negative when below it). */
  datumOffsetMm: number;
  /** A mark every this many litres (give this or `everyVolume`). */
  everyL?: number;
  /** A mark every `value` of `unit`, e.g. { value: 10, unit: 'usgal' } (give this or `everyL`). */
  everyVolume?: { value: number; unit: VolumeUnit };
  /** Labels are in this system's volume unit (L or US gal); the edge scale in mm or inches. */
  unitSystem: UnitSystem;
  /** Portrait page in mm; A4 with a 10 mm margin when left out. */
  page?: GaugePage;
}

/** One volume mark at `positionMm` on the tube (mm above its zero mark). */
export interface GaugeTick {
  /** Tube position, mm above the tube's zero mark. */
  positionMm: number;
  /** Level above the tank floor, mm. */
  levelMm: number;
  /** The mark's volume, L. */
  volumeL: number;
  /** The mark's volume in the layout's `volumeUnit`. */
  volume: number;
  /** Text printed beside the mark ("250 L", "60 gal"). */
  label: string;
  /** Long mark with a bold label (see `majorEvery`). */
  major: boolean;
  /** Whether the label is printed: always for major marks, for minor ones only with room on both sides. */
  labelShown: boolean;
}

/** One mark of the length scale along the strip's edge, at `positionMm` on the tube. */
export interface GaugeScaleMark {
  positionMm: number;
  /** small: every mm (every 0.1 in); medium: every 5 mm (0.5 in); large: every 10 mm (1 in), labelled. */
  size: 'small' | 'medium' | 'large';
  /** The tube reading printed beside a large mark ("120" mm, "4" in), else null. */
  label: string | null;
}

/** An alignment mark where two pages meet, at `positionMm` on the tube. */
export interface GaugeJoin {
  positionMm: number;
  /** Join number: join n is between pages n and n + 1 (both print the same number). */
  join: number;
  /** cut: the top edge of the lower page, cut off here; match: where that cut edge is laid on the upper page. */
  role: 'cut' | 'match';
  /** The 1-based number of the page on the other side of this join. */
  otherPage: number;
  /** The instruction printed at the join. */
  text: string;
}

/** One printed page: the tube positions [fromMm, toMm) it covers (the last page includes toMm). */
export interface GaugeStripPage {
  /** 0-based page index. */
  index: number;
  /** "1 of 3". */
  label: string;
  fromMm: number;
  toMm: number;
  ticks: GaugeTick[];
  scale: GaugeScaleMark[];
  joins: GaugeJoin[];
}

/** A whole strip: pages bottom to top, with everything a renderer needs (lengths in mm). */
export interface GaugeStripLayout {
  pages: GaugeStripPage[];
  totalPages: number;
  page: GaugePage;
  /** Height of the strip area of every page, mm; page i covers tube positions from i·stripHeightMm. */
  stripHeightMm: number;
  /** Distance from the bottom edge of the paper to the strip's lowest point (the page's fromMm), mm. */
  stripBottomMm: number;
  /** Tube position of the top of the tank, mm: the strip ends here. */
  topPositionMm: number;
  /** Tube position of the tank floor when the tube's zero mark is below it, else null (floor not on the strip). */
  floorPositionMm: number | null;
  datumOffsetMm: number;
  /** The step as asked for, and in litres. */
  step: { value: number; unit: VolumeUnit };
  stepL: number;
  /** Unit of every tick's `volume` and label. */
  volumeUnit: 'L' | 'usgal';
  /** Unit of the edge scale's labels. */
  scaleUnit: 'mm' | 'in';
  /** Every `majorEvery`-th step (counting from 0) is a major mark. */
  majorEvery: number;
  tickCount: number;
}
