/**
 * A horizontal range chart of field against simulation: per row the simulated central 95 % as a
 * band with its mean, the planned value as a tick (durations), and the field values as markers
 * (a hollow diamond when outside the band). Named by its caption; every value is also in the
 * panel's tables, and each marker carries its value as a title.
 */
import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { Chart } from './field-trials-figures';

const LABEL = 90;
const ROW = 26;

@Component({
  selector: 'app-trial-range-chart',
  template: `
    <figure>
      <figcaption>{{ caption() }}</figcaption>
      <svg [attr.viewBox]="'0 0 ' + (label + chart().width + 12) + ' ' + (chart().rows.length * row + 24)" role="img" [attr.aria-label]="caption()">
        @for (r of chart().rows; track $index; let i = $index) {
          <g [attr.transform]="'translate(' + label + ',' + (i * row) + ')'">
            <text [attr.x]="-6" [attr.y]="row / 2 + 4" class="label">{{ r.label }}</text>
            @if (r.band; as b) { <rect class="band" [attr.x]="b.x1" y="5" [attr.width]="b.x2 - b.x1 || 1" [attr.height]="row - 10"><title>Simulated central 95 %</title></rect> }
            @if (r.mean !== null) { <line class="mean" [attr.x1]="r.mean" [attr.x2]="r.mean" y1="5" [attr.y2]="row - 5" /> }
            @if (r.tick !== null) { <line class="planned" [attr.x1]="r.tick" [attr.x2]="r.tick" y1="2" [attr.y2]="row - 2"><title>Planned</title></line> }
            @for (p of r.points; track $index) {
              <path [class.outside]="p.isOutside" class="point" [attr.d]="'M' + p.x + ' ' + (row / 2 - 6) + ' l6 6 l-6 6 l-6 -6 z'"><title>{{ p.title }}{{ p.isOutside ? ' (outside the simulated 95 %)' : '' }}</title></path>
            }
          </g>
        }
        <g [attr.transform]="'translate(' + label + ',' + (chart().rows.length * row) + ')'">
          <line x1="0" y1="2" [attr.x2]="chart().width" y2="2" class="axis" />
          @for (t of chart().axis; track $index) { <text [attr.x]="t.x" y="16" class="tick">{{ t.label }}</text> }
        </g>
      </svg>
      <p class="legend">Band: central 95 % of simulated runs, line: simulated mean@if (hasTicks()) {, tall line: planned}; ◆ field run (hollow: outside the band).</p>
    </figure>`,
  styles: [`
    :host { display: block; max-width: 640px; }
    figure { margin: 8px 0; }
    figcaption { font: var(--mat-sys-title-small); margin-bottom: 4px; }
    svg { width: 100%; height: auto; }
    .label { font: 11px 'Fira Sans', system-ui, sans-serif; text-anchor: end; fill: var(--mat-sys-on-surface); }
    .band { fill: var(--mat-sys-secondary-container); stroke: var(--mat-sys-secondary); stroke-width: 0.5; }
    .mean { stroke: var(--mat-sys-secondary); stroke-width: 2; }
    .planned { stroke: var(--mat-sys-on-surface); stroke-dasharray: 3 2; }
    .point { fill: var(--mat-sys-primary); stroke: var(--mat-sys-primary); stroke-width: 1.5; }
    .point.outside { fill: var(--mat-sys-surface); stroke: var(--mat-sys-error); stroke-width: 2; }
    .axis { stroke: var(--mat-sys-outline); }
    .tick { font: 10px 'Fira Sans', system-ui, sans-serif; text-anchor: middle; fill: var(--mat-sys-on-surface-variant); }
    .legend { font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); margin: 2px 0 0; }
  `],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrialRangeChart {
  readonly chart = input.required<Chart>();
  readonly caption = input.required<string>();
  protected readonly label = LABEL;
  protected readonly row = ROW;
  protected hasTicks(): boolean {
    return this.chart().rows.some((r) => r.tick !== null);
  }
}
