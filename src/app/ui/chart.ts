import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import {
  BarController,
  BarElement,
  CategoryScale,
  Legend,
  LineController,
  LineElement,
  LinearScale,
  PointElement,
  Tooltip,
  type ChartConfiguration,
  type ChartType,
  type Plugin,
} from 'chart.js';
import { BaseChartDirective, provideCharts } from 'ng2-charts';

/**
 * A chart on a canvas, with only the chart parts our reports and readings use (bars and lines over
 * categories). Pages place it in a `@defer` block inside a box of fixed height, so chart.js loads in
 * a chunk of its own, after the page, and the page does not move when it draws.
 */
@Component({
  selector: 'sw-chart',
  imports: [BaseChartDirective],
  providers: [provideCharts({ registerables: [BarController, BarElement, LineController, LineElement, PointElement, CategoryScale, LinearScale, Legend, Tooltip] })],
  template: `<canvas baseChart [type]="config().type" [data]="config().data" [options]="config().options" [plugins]="plugins()" role="img" [attr.aria-label]="label()"></canvas>`,
  styles: ':host { display: block; position: relative; height: 100%; }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Chart {
  readonly config = input.required<ChartConfiguration<ChartType>>();
  readonly plugins = input<Plugin[]>([]);
  /** What the chart shows, in words, for a screen reader. */
  readonly label = input.required<string>();
}
