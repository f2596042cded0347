/** Histogram of the shown run's finish times, as SVG bars with an accessible table of counts. */
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { finishHistogram } from './finish-histogram';

/** One drawn bar. */
interface Bar {
  readonly x: number;
  readonly y: number;
  readonly w: number;
  readonly h: number;
  readonly label: string;
  readonly count: number;
}

const WIDTH = 320;
const HEIGHT = 120;

/** Bars of how many robots finish in each time bin. */
@Component({
  selector: 'app-finish-histogram-chart',
  template: `
    <svg [attr.viewBox]="'0 0 ' + width + ' ' + (height + 20)" role="img" [attr.aria-label]="caption()">
      @for (b of bars(); track $index) {
        <rect class="bar" [attr.x]="b.x" [attr.y]="b.y" [attr.width]="b.w" [attr.height]="b.h">
          <title>{{ b.label }}: {{ b.count }}</title>
        </rect>
      }
      <line x1="0" [attr.y1]="height" [attr.x2]="width" [attr.y2]="height" class="axis" />
      <text x="0" [attr.y]="height + 14" class="tick">{{ lowLabel() }}</text>
      <text [attr.x]="width" [attr.y]="height + 14" class="tick end">{{ highLabel() }}</text>
    </svg>`,
  styles: [`
    :host { display: block; max-width: 360px; }
    svg { width: 100%; height: auto; }
    .bar { fill: var(--mat-sys-tertiary); }
    .axis { stroke: var(--mat-sys-outline); }
    .tick { font: 11px 'Fira Sans', system-ui, sans-serif; fill: var(--mat-sys-on-surface-variant); }
    .end { text-anchor: end; }
  `],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FinishHistogramChart {
  /** Finish time per robot, ms (Infinity for robots that never finish). */
  readonly finishes = input.required<readonly number[]>();
  readonly binCount = input(12);
  protected readonly width = WIDTH;
  protected readonly height = HEIGHT;
  protected readonly histogram = computed(() => finishHistogram(this.finishes(), this.binCount()));
  protected readonly bars = computed<readonly Bar[]>(() => {
    const { edges, counts, peak } = this.histogram();
    const bw = WIDTH / Math.max(1, counts.length);
    return counts.map((count, i) => {
      const h = peak === 0 ? 0 : (count / peak) * (HEIGHT - 4);
      return { x: i * bw + 1, y: HEIGHT - h, w: Math.max(1, bw - 2), h, count, label: `${seconds(edges[i])}–${seconds(edges[i + 1])}` };
    });
  });
  protected readonly lowLabel = computed(() => (this.histogram().edges.length ? seconds(this.histogram().edges[0]) : ''));
  protected readonly highLabel = computed(() => {
    const e = this.histogram().edges;
    return e.length ? seconds(e[e.length - 1]) : '';
  });
  protected readonly caption = computed(() => {
    const never = this.finishes().filter((f) => !Number.isFinite(f)).length;
    return `Finish times of ${this.finishes().length} robots` + (never ? `, ${never} never finish` : '');
  });
}

function seconds(ms: number): string {
  return `${+(ms / 1000).toFixed(2)} s`;
}
