// The echarts parts the board's 14-day chart draws with. Kept in a module of their own so the
// bundler gives them their own chunk: with echarts' core beside them one chunk would pass 500 kB.
import { use } from 'echarts/core';
import { LineChart } from 'echarts/charts';
import { GridComponent, LegendComponent, TooltipComponent } from 'echarts/components';
import { CanvasRenderer } from 'echarts/renderers';

/** Registers the line chart, grid, tooltip, legend and canvas renderer with echarts (idempotent). */
export function registerBoardChartParts(): void {
  use([LineChart, GridComponent, TooltipComponent, LegendComponent, CanvasRenderer]);
}
