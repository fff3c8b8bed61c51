import type { Chart, Plugin } from 'chart.js';

export interface Band {
  min?: number;
  max?: number;
}

/**
 * Shades each reading's normal band behind the line, one column per visit, so a band that moved
 * (a superheat target follows the weather) is drawn as it was judged. Works for a single visit too.
 */
export function bandPlugin(bands: () => Band[], colour: string): Plugin<'line'> {
  return {
    id: 'swBand',
    beforeDatasetsDraw(chart: Chart<'line'>) {
      const x = chart.scales['x'];
      const y = chart.scales['y'];
      const area = chart.chartArea;
      const list = bands();
      if (!x || !y || !area || !list.length) return;
      const step = list.length > 1 ? Math.abs(x.getPixelForValue(1) - x.getPixelForValue(0)) : area.right - area.left;
      const ctx = chart.ctx;
      ctx.save();
      ctx.beginPath();
      ctx.rect(area.left, area.top, area.right - area.left, area.bottom - area.top);
      ctx.clip();
      ctx.fillStyle = colour;
      list.forEach((b, i) => {
        if (b.min === undefined && b.max === undefined) return;
        const top = y.getPixelForValue(b.max ?? y.max);
        const bottom = y.getPixelForValue(b.min ?? y.min);
        const centre = list.length > 1 ? x.getPixelForValue(i) : (area.left + area.right) / 2;
        ctx.fillRect(centre - step / 2, top, step, bottom - top);
      });
      ctx.restore();
    },
  };
}
