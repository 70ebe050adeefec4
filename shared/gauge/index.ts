// Gauge strip: volume marks for a tank's sight tube at true scale, tiled over printable pages.
// Lengths in millimetres on the tube's own scale (0 at the tube's zero mark), volumes in litres.
export {
  GAUGE_PAPERS,
  PAPER_SIZES_MM,
  GAUGE_MARGIN_MM,
  GAUGE_HEADER_MM,
  MIN_GAUGE_CONTENT_WIDTH_MM,
  MIN_GAUGE_STRIP_HEIGHT_MM,
  gaugePage,
} from './paper';
export type { GaugePaper, GaugePage } from './paper';
export {
  MIN_TICK_GAP_MM,
  MINOR_LABEL_GAP_MM,
  SUGGESTED_TICK_GAP_MM,
  MAX_GAUGE_PAGES,
  GaugeStripError,
  gaugeStripLayout,
  suggestGaugeStep,
} from './layout';
export type { GaugeStripInput, GaugeTick, GaugeScaleMark, GaugeJoin, GaugeStripPage, GaugeStripLayout } from './layout';
