/**
 * The per-robot timeline of one run on a canvas, with a legend and the clock's cursor; the chain
 * that set the realised makespan (if given) is outlined over the bars. Categories differ by colour
 * and, where rows are tall enough to show it, by pattern (GANTT_PATTERNS; the legend shows both).
 */
import { ChangeDetectionStrategy, Component, ElementRef, computed, effect, inject, input, viewChild } from '@angular/core';
import { CONTEXT_2D, offscreenCanvas } from './canvas-context';
import { GANTT_KINDS, GANTT_LABELS, ganttRowHeight, type GanttSegments } from './gantt-layout';
import type { ChainSegment } from './run-attribution';
import type { ReplayClock } from './replay-clock';
import { GANTT_COLOURS, GANTT_PATTERNS, ganttFill, ganttSwatch, PATTERN_TILE_PX } from './viewer-palette';

/** Outline of the chain that set the realised makespan (near black, apart from every bar colour). */
const CHAIN_COLOUR = '#1b1b1f';

/** Height left for the time axis under the rows, px. */
const AXIS_PX = 18;
/** Height of the chart before it scrolls, px. */
const ROWS_VIEWPORT_PX = 340;

/** A step of 1, 2 or 5 × 10^n ms giving about `target` ticks over `span` (common practice for axis ticks). */
export function tickStep(span: number, target = 6): number {
  if (!(span > 0)) return 1;
  const raw = span / target;
  const base = 10 ** Math.floor(Math.log10(raw));
  const m = raw / base;
  return (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * base;
}

/** Gantt chart of forward / turn / wait / held / stopped segments per robot. */
@Component({
  selector: 'app-gantt-chart',
  template: `
    <div class="rows" role="region" [style.max-height.px]="viewportPx" tabindex="0" [attr.aria-label]="robotCount() + ' robot rows' + (heightPx() > viewportPx ? ', scroll for more' : '')">
      <canvas #canvas role="img" [attr.aria-label]="label()" [style.width.px]="widthPx()" [style.height.px]="heightPx()"></canvas>
    </div>
    <ul class="legend" aria-label="Timeline legend">
      @for (k of kinds; track k) {
        <li [attr.data-kind]="k" [attr.data-pattern]="patterns[k]"><span class="swatch" [style.background]="swatches[k]"></span>{{ labels[k] }}</li>
      }
      @if (chain().length > 0) { <li><span class="swatch is-chain"></span>Chain that set the realised makespan</li> }
    </ul>`,
  styles: [`
    :host { display: block; }
    canvas { display: block; }
    /* Many robots scroll here instead of squeezing their rows (GANTT_MIN_ROW_PX). */
    .rows { overflow-y: auto; overflow-x: hidden; max-width: 100%; }
    .legend { display: flex; flex-wrap: wrap; gap: 4px 14px; list-style: none; margin: 6px 0 0; padding: 0; font: var(--mat-sys-body-small); }
    .swatch { display: inline-block; width: 14px; height: 12px; margin-right: 5px; border-radius: 2px; vertical-align: -2px; }
    .swatch.is-chain { width: 12px; height: 10px; border: 1px solid; border-color: #1b1b1f; background: transparent; }
  `],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GanttChart {
  private readonly makeContext = inject(CONTEXT_2D);
  readonly segments = input.required<GanttSegments>();
  readonly robotCount = input.required<number>();
  readonly clock = input.required<ReplayClock>();
  readonly widthPx = input(560);
  readonly label = input('Per-robot timeline');
  /** Segments of the chain that set the realised makespan (robots 0-based), outlined. */
  readonly chain = input<readonly ChainSegment[]>([]);
  private readonly canvas = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');
  protected readonly kinds = GANTT_KINDS;
  protected readonly labels = GANTT_LABELS;
  protected readonly patterns = GANTT_PATTERNS;
  protected readonly swatches = Object.fromEntries(GANTT_KINDS.map((k) => [k, ganttSwatch(k)])) as Record<(typeof GANTT_KINDS)[number], string>;
  /** Visible height of the rows before they scroll, px. */
  protected readonly viewportPx = ROWS_VIEWPORT_PX;
  protected readonly rowPx = computed(() => ganttRowHeight(this.robotCount(), ROWS_VIEWPORT_PX - AXIS_PX));
  protected readonly heightPx = computed(() => this.robotCount() * this.rowPx() + AXIS_PX);

  constructor() {
    effect((onCleanup) => {
      const canvas = this.canvas().nativeElement;
      const w = this.widthPx();
      const h = this.heightPx();
      canvas.width = w;
      canvas.height = h;
      const ctx = this.makeContext(canvas);
      if (!ctx) return;
      const segs = this.segments();
      const row = this.rowPx();
      const horizon = Math.max(1, segs.horizonMs);
      const scale = w / horizon;
      const bars = offscreenCanvas(w, h);
      const bctx = this.makeContext(bars);
      if (!bctx) return;
      const gap = row >= 6 ? 1 : 0;
      // Patterns need a few pixels of height to read; thinner rows keep the plain colours.
      const patterned = row >= PATTERN_TILE_PX / 2 + 2 * gap;
      for (let k = 0; k < GANTT_KINDS.length; k++) {
        const kind = GANTT_KINDS[k];
        bctx.fillStyle = patterned ? ganttFill(kind, this.makeContext, bctx as CanvasRenderingContext2D, offscreenCanvas(PATTERN_TILE_PX, PATTERN_TILE_PX)) : GANTT_COLOURS[kind];
        for (let i = 0; i < segs.count; i++) {
          if (segs.kind[i] !== k) continue;
          const x0 = segs.t0[i] * scale;
          bctx.fillRect(x0, segs.robot[i] * row + gap, Math.max(1, (segs.t1[i] - segs.t0[i]) * scale), row - 2 * gap);
        }
      }
      // The chain on top: a dark outline, thick enough to read on any bar colour.
      bctx.strokeStyle = CHAIN_COLOUR;
      bctx.lineWidth = 2;
      for (const c of this.chain()) {
        const x0 = c.fromMs * scale;
        bctx.strokeRect(x0 + 1, c.robot * row + 1, Math.max(2, (c.toMs - c.fromMs) * scale - 2), Math.max(2, row - 2));
      }
      const axisY = this.robotCount() * row;
      const step = tickStep(horizon);
      bctx.fillStyle = '#4a5a5e';
      bctx.font = '11px "Fira Sans", system-ui, sans-serif';
      bctx.textBaseline = 'top';
      for (let t = 0; t <= horizon + 1e-9; t += step) {
        const x = Math.min(w - 1, t * scale);
        bctx.fillRect(x, axisY, 1, 4);
        bctx.textAlign = x < 20 ? 'left' : x > w - 20 ? 'right' : 'center';
        bctx.fillText(`${+(t / 1000).toFixed(2)} s`, x, axisY + 5);
      }
      onCleanup(this.clock().onFrame((t) => {
        ctx.clearRect(0, 0, w, h);
        ctx.drawImage(bars, 0, 0);
        ctx.fillStyle = '#c62f3a';
        ctx.fillRect(Math.min(w - 2, t * scale), 0, 2, axisY);
      }));
    });
  }
}
