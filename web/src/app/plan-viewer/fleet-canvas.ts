/**
 * The fleet replay canvas of one pane: map once, robots every frame of the shared clock, with
 * zoom (buttons, wheel, + and −) and pan (drag, arrow keys) as in the map viewer (the shared
 * ViewNavigator of maps/view-navigator.ts). A large map opens at a readable cell size around its
 * centre; "Whole map" shows all of it.
 */
import { ChangeDetectionStrategy, Component, ElementRef, computed, effect, inject, input, untracked, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import type { CollisionView, ExecutionInstanceView } from '@shared/executions';
import type { RobotProfile } from '@shared/plan';
import { zoomAt, type ViewTransform } from '../maps/map-view-math';
import { BUTTON_ZOOM, ViewNavigator, canvasPoint } from '../maps/view-navigator';
import { CONTEXT_2D } from './canvas-context';
import { FleetScene, sceneCellPixels } from './fleet-scene';
import type { FleetTrack } from './fleet-track';
import type { ReplayClock } from './replay-clock';
import { fleetPalette } from './viewer-palette';

/** A robot stays readable (its disk and heading tick visible) from this many pixels per cell (common practice: ~8 px marks). */
export const READABLE_CELL_PX = 8;
/** The canvas is never lower than this, px, however flat the map. */
const MIN_HEIGHT_PX = 260;

/** The CSS size of the canvas for a map in `maxPx` of width: the map's aspect, between MIN_HEIGHT_PX and `maxPx` high. */
export function fleetCanvasSize(mapWidth: number, mapHeight: number, maxPx: number): { readonly w: number; readonly h: number } {
  const h = Math.round((maxPx * mapHeight) / Math.max(1, mapWidth));
  return { w: maxPx, h: Math.max(MIN_HEIGHT_PX, Math.min(maxPx, h)) };
}

/** The view a replay opens with: the whole map, or, when that is below READABLE_CELL_PX per cell, a readable zoom about the centre. */
export function startView(fitted: ViewTransform, viewSize: readonly [number, number]): ViewTransform {
  if (fitted.scale >= READABLE_CELL_PX) return fitted;
  const factor = READABLE_CELL_PX / fitted.scale;
  return zoomAt(fitted, factor, viewSize[0] / 2, viewSize[1] / 2, { min: fitted.scale, max: READABLE_CELL_PX });
}

/** Canvas showing one run of the fleet at the clock's time. */
@Component({
  selector: 'app-fleet-canvas',
  template: `
    <div class="tools" role="toolbar" [attr.aria-label]="'Zoom of the ' + label()">
      <button mat-stroked-button type="button" class="step" (click)="nav.zoomBy(buttonZoom)" aria-label="Zoom in">+</button>
      <button mat-stroked-button type="button" class="step" (click)="nav.zoomBy(1 / buttonZoom)" aria-label="Zoom out">−</button>
      <button mat-stroked-button type="button" (click)="nav.fit()">Whole map</button>
      <span class="zoom qt-figure" data-testid="fleet-zoom">{{ nav.zoomText() }}</span>
    </div>
    <canvas #canvas tabindex="0" role="img"
      [attr.aria-label]="label() + '; drag to pan, wheel or plus and minus to zoom'"
      [style.width.px]="size().w" [style.height.px]="size().h"
      (wheel)="nav.zoomWithWheel($event, point($event))"
      (pointerdown)="nav.startDrag($event)" (pointermove)="nav.dragTo($event)"
      (pointerup)="nav.endDrag($event)" (pointercancel)="nav.endDrag($event)"
      (keydown)="nav.handleKey($event)"></canvas>`,
  styles: [`
    :host { display: block; }
    .tools { display: flex; align-items: center; gap: 4px; padding-bottom: 4px; }
    .step { min-width: 2.5rem; }
    .zoom { margin-left: 8px; font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
    canvas { display: block; box-sizing: border-box; touch-action: none; cursor: grab; border-radius: var(--mat-sys-corner-small); background: var(--mat-sys-surface-container); }
    canvas:focus-visible { outline: 2px solid var(--mat-sys-primary); outline-offset: 2px; }
  `],
  imports: [MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FleetCanvas {
  private readonly makeContext = inject(CONTEXT_2D);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  readonly instance = input.required<ExecutionInstanceView>();
  readonly track = input<FleetTrack | null>(null);
  readonly profile = input.required<RobotProfile>();
  readonly collisions = input<readonly CollisionView[]>([]);
  readonly clock = input.required<ReplayClock>();
  /** Width of the drawing, CSS px. */
  readonly maxPx = input(560);
  readonly label = input('Fleet replay');
  private readonly canvas = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');
  protected readonly size = computed(() => fleetCanvasSize(this.instance().width, this.instance().height, this.maxPx()));
  /** Zoom and pan, as in the map viewer. */
  protected readonly nav = new ViewNavigator(() => [this.instance().width, this.instance().height], startView);
  protected readonly buttonZoom = BUTTON_ZOOM;

  constructor() {
    // A new map or canvas size opens at the start view.
    effect(() => {
      const { w, h } = this.size();
      this.instance();
      untracked(() => this.nav.resize(w, h, true));
    });
    effect((onCleanup) => {
      const canvas = this.canvas().nativeElement;
      const { w, h } = this.size();
      const dpr = window.devicePixelRatio || 1;
      canvas.width = Math.round(w * dpr);
      canvas.height = Math.round(h * dpr);
      const ctx = this.makeContext(canvas);
      if (!ctx) return;
      const instance = this.instance();
      // The scene draws in its own pixels (sceneCell per cell); the view transform scales them to the zoom.
      const sceneCell = sceneCellPixels(instance.width, instance.height);
      const scene = new FleetScene(ctx, instance, this.track(), this.profile(), this.collisions(),
        fleetPalette(this.host.nativeElement), sceneCell, this.makeContext);
      onCleanup(this.clock().onFrame((t) => untracked(() => {
        const v = this.nav.view();
        const k = v.scale / sceneCell;
        ctx.setTransform(1, 0, 0, 1, 0, 0);
        ctx.clearRect(0, 0, canvas.width, canvas.height);
        ctx.setTransform(dpr * k, 0, 0, dpr * k, dpr * v.offsetX, dpr * v.offsetY);
        ctx.imageSmoothingEnabled = false;
        scene.draw(t);
      })));
    });
    // Zooming or panning while paused draws the same instant again.
    effect(() => {
      this.nav.view();
      untracked(() => this.clock().redraw());
    });
  }

  /** The canvas point of a pointer event. */
  protected point(event: MouseEvent): readonly [number, number] {
    return canvasPoint(this.canvas().nativeElement, event);
  }
}
