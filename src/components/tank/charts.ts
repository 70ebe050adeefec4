// The echarts pieces the tank charts draw with, registered once; nothing else of echarts is bundled.
import { use, type ComposeOption } from 'echarts/core';
import { LineChart, type LineSeriesOption } from 'echarts/charts';
import {
  GridComponent,
  MarkLineComponent,
  TooltipComponent,
  type GridComponentOption,
  type MarkLineComponentOption,
  type TooltipComponentOption,
} from 'echarts/components';
import { CanvasRenderer } from 'echarts/renderers';
import { FONT_FAMILY, loch, moss, shale, tide } from '@/theme/preset';
import { tankText } from './tankWords';

use([LineChart, GridComponent, TooltipComponent, MarkLineComponent, CanvasRenderer]);

/** The option shape the tank charts may use. */
export type TankChartOption = ComposeOption<LineSeriesOption | GridComponentOption | TooltipComponentOption | MarkLineComponentOption>;

/** Colours from the preset: teal for gross volume, moss for usable, loch blue for level. */
export const CHART_COLOURS = { gross: tide[600], usable: moss[600], level: loch[500], grid: shale[200], axis: shale[600], text: shale[800], warn: '#a3620c' } as const;

/** Text in Open Sans like the rest of the page (echarts would use its own sans-serif). */
export const CHART_TEXT = { fontFamily: FONT_FAMILY, color: shale[800], fontSize: 12 } as const;

/** The one volume the history chart draws: usable litres (above the outlet) or all the litres in the tank. */
export type HistoryMeasure = 'usable' | 'gross';

/** What each measure is called on the chart and in its chooser, in the current language (read when shown). */
export const HISTORY_MEASURE_NAMES: Readonly<Record<HistoryMeasure, string>> = {
  get usable() {
    return tankText('history.measures.usable');
  },
  get gross() {
    return tankText('history.measures.gross');
  },
};
