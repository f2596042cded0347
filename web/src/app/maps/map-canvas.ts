/**
 * A map on a canvas with zoom (wheel, buttons) and pan (drag). The terrain is painted once into
 * an offscreen bitmap (ImageData, one pixel per cell); each frame only draws that bitmap through
 * the view transform plus the start/goal markers, so a 1024 × 1024 map stays smooth.
 * Without a pointer: arrow keys pan, and Shift + arrow keys move a cursor cell (drawn as a
 * two-tone square, kept in view) that is reported like the cell under the pointer.
 */
import {
  ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, afterRenderEffect, inject,
  input, output, signal, viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import type { CellXY } from '@shared/plan';
import { CanvasHost } from './canvas-host';
import { agentColour, paintMap } from './map-bitmap';
import { cellAt, cellCentre, keepCellInView, stepCursor, type ViewTransform } from './map-view-math';
import { BUTTON_ZOOM, ViewNavigator, canvasPoint } from './view-navigator';

/** One agent's start and goal to draw over the map. */
export interface AgentMarker {
  readonly start: CellXY;
  readonly goal: CellXY;
}

/** Grid lines appear once a cell is at least this many pixels wide. */
const GRID_LINE_SCALE = 10;

/** The zoomable, pannable map canvas. */
@Component({
  selector: 'app-map-canvas',
  templateUrl: './map-canvas.html',
  styleUrl: './map-canvas.scss',
  imports: [MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MapCanvas {
  private readonly host = inject(CanvasHost);
  private readonly element = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly canvasRef = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');
  /** Terrain rows, one string of `width` characters each. */
  readonly rows = input.required<readonly string[]>();
  readonly mapWidth = input.required<number>();
  readonly mapHeight = input.required<number>();
  /** Starts and goals to draw; agent i gets agentColour(i). */
  readonly markers = input<readonly AgentMarker[]>([]);
  /** The cell under the pointer (else the keyboard cursor cell), or null when neither is on the map. */
  readonly hoverCell = output<readonly [number, number] | null>();
  /** The keyboard cursor cell; null until Shift + an arrow key places it. */
  protected readonly cursor = signal<readonly [number, number] | null>(null);

  /** Zoom and pan (shared with the plan viewer's fleet canvas). */
  private readonly nav = new ViewNavigator(() => [this.mapWidth(), this.mapHeight()]);
  private readonly view = this.nav.view;
  private readonly viewSize = this.nav.viewSize;
  private bitmap: HTMLCanvasElement | null = null;
  private frame = 0;
  /** Whether the canvas can draw at all (false under jsdom). */
  protected readonly hasCanvas = signal(true);
  /** Cells per screen pixel shown to the user, as a zoom readout. */
  protected readonly zoomText = this.nav.zoomText;

  constructor() {
    const destroyRef = inject(DestroyRef);
    afterNextRender(() => {
      const canvas = this.canvasRef().nativeElement;
      // The frame is sized by the layout (map-canvas.scss); the buffer follows the canvas's
      // content box, which fills the frame, once per layout change.
      const resize = () => {
        const [width, height] = [canvas.clientWidth, canvas.clientHeight];
        const dpr = window.devicePixelRatio || 1;
        canvas.width = Math.max(1, Math.round(width * dpr));
        canvas.height = Math.max(1, Math.round(height * dpr));
        this.nav.resize(width, height);
        this.scheduleDraw();
      };
      const observer = new ResizeObserver(resize);
      observer.observe(canvas.parentElement ?? canvas);
      resize();
      destroyRef.onDestroy(() => {
        observer.disconnect();
        cancelAnimationFrame(this.frame);
      });
    });
    // Repaint the terrain bitmap only when the map itself changes.
    afterRenderEffect(() => {
      this.bitmap = this.paintBitmap(this.rows(), this.mapWidth(), this.mapHeight());
      this.nav.fit();
      this.scheduleDraw();
    });
    afterRenderEffect(() => {
      this.view();
      this.markers();
      this.cursor();
      this.scheduleDraw();
    });
  }

  /** Shows the whole map again. */
  protected fitToView(): void {
    this.nav.fit();
  }

  /** Zooms about the centre of the canvas. */
  protected zoomBy(factor: number): void {
    this.nav.zoomBy(factor);
  }

  protected readonly buttonZoom = BUTTON_ZOOM;

  /** Wheel zoom about the pointer. */
  protected zoomWithWheel(event: WheelEvent): void {
    this.nav.zoomWithWheel(event, this.localPoint(event));
  }

  protected startDrag(event: PointerEvent): void {
    this.nav.startDrag(event);
  }

  /** Pans while dragging and reports the cell under the pointer. */
  protected trackPointer(event: PointerEvent): void {
    this.nav.dragTo(event);
    const [px, py] = this.localPoint(event);
    this.hoverCell.emit(cellAt(this.view(), px, py, this.mapWidth(), this.mapHeight()));
  }

  protected endDrag(event: PointerEvent): void {
    this.nav.endDrag(event);
  }

  protected leaveCanvas(): void {
    if (!this.nav.isDragging) this.hoverCell.emit(this.cursor());
  }

  /**
   * Arrow keys pan, + and − zoom, 0 fits; Shift + arrow keys move the cursor cell (placed first at
   * the cell in the middle of the view) and Escape takes it away: the canvas is usable without a pointer.
   */
  protected moveWithKeys(event: KeyboardEvent): void {
    if (event.key === 'Escape' && this.cursor()) {
      this.cursor.set(null);
      this.hoverCell.emit(null);
      return;
    }
    if (event.shiftKey) {
      const [w, h] = this.viewSize();
      const middle = cellAt(this.view(), w / 2, h / 2, this.mapWidth(), this.mapHeight())
        ?? [Math.floor(this.mapWidth() / 2), Math.floor(this.mapHeight() / 2)] as const;
      const next = stepCursor(this.cursor(), event.key, middle, this.mapWidth(), this.mapHeight());
      if (next) {
        event.preventDefault();
        this.cursor.set(next);
        this.nav.view.update((t) => keepCellInView(t, next[0], next[1], w, h));
        this.hoverCell.emit(next);
        return;
      }
    }
    this.nav.handleKey(event);
  }

  private localPoint(event: MouseEvent): readonly [number, number] {
    // Relative to the content box (the view's coordinates), inside the canvas's border.
    return canvasPoint(this.canvasRef().nativeElement, event);
  }

  private paintBitmap(rows: readonly string[], width: number, height: number): HTMLCanvasElement | null {
    const bitmap = document.createElement('canvas');
    bitmap.width = width;
    bitmap.height = height;
    const ctx = this.host.context2d(bitmap);
    if (!ctx) {
      this.hasCanvas.set(false);
      return null;
    }
    const image = ctx.createImageData(width, height);
    image.data.set(paintMap(rows, width, height, this.host.palette(this.element.nativeElement)));
    ctx.putImageData(image, 0, 0);
    return bitmap;
  }

  private scheduleDraw(): void {
    if (this.frame) return;
    this.frame = requestAnimationFrame(() => {
      this.frame = 0;
      this.draw();
    });
  }

  private draw(): void {
    const canvas = this.canvasRef().nativeElement;
    const ctx = this.host.context2d(canvas);
    if (!ctx || !this.bitmap) return;
    const dpr = window.devicePixelRatio || 1;
    const t = this.view();
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    ctx.clearRect(0, 0, canvas.width, canvas.height);
    ctx.setTransform(dpr * t.scale, 0, 0, dpr * t.scale, dpr * t.offsetX, dpr * t.offsetY);
    ctx.imageSmoothingEnabled = false;
    ctx.drawImage(this.bitmap, 0, 0);
    if (t.scale >= GRID_LINE_SCALE) this.drawGrid(ctx, t);
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    this.drawMarkers(ctx, t);
    this.drawCursor(ctx, t);
  }

  /** The cursor cell: a dark square inside a light one, seen on free and blocked cells alike. */
  private drawCursor(ctx: CanvasRenderingContext2D, t: ViewTransform): void {
    const cell = this.cursor();
    if (!cell) return;
    const size = Math.max(t.scale, 8);
    const [cx, cy] = cellCentre(t, cell[0], cell[1]);
    ctx.lineWidth = 4;
    ctx.strokeStyle = '#ffffff';
    ctx.strokeRect(cx - size / 2, cy - size / 2, size, size);
    ctx.lineWidth = 2;
    ctx.strokeStyle = '#000000';
    ctx.strokeRect(cx - size / 2, cy - size / 2, size, size);
  }

  /** Lines between the visible cells only (never all million of a large map). */
  private drawGrid(ctx: CanvasRenderingContext2D, t: ViewTransform): void {
    const [w, h] = this.viewSize();
    const x0 = Math.max(0, Math.floor(-t.offsetX / t.scale));
    const y0 = Math.max(0, Math.floor(-t.offsetY / t.scale));
    const x1 = Math.min(this.mapWidth(), Math.ceil((w - t.offsetX) / t.scale));
    const y1 = Math.min(this.mapHeight(), Math.ceil((h - t.offsetY) / t.scale));
    ctx.beginPath();
    for (let x = x0; x <= x1; x++) {
      ctx.moveTo(x, y0);
      ctx.lineTo(x, y1);
    }
    for (let y = y0; y <= y1; y++) {
      ctx.moveTo(x0, y);
      ctx.lineTo(x1, y);
    }
    ctx.lineWidth = 1 / t.scale;
    ctx.strokeStyle = 'rgba(0, 0, 0, 0.12)';
    ctx.stroke();
  }

  /** Starts as filled discs, goals as rings of the same colour, joined by a faint line. */
  private drawMarkers(ctx: CanvasRenderingContext2D, t: ViewTransform): void {
    const radius = Math.max(2.5, t.scale * 0.36);
    this.markers().forEach((m, i) => {
      const colour = agentColour(i);
      const [sx, sy] = cellCentre(t, m.start[0], m.start[1]);
      const [gx, gy] = cellCentre(t, m.goal[0], m.goal[1]);
      ctx.strokeStyle = colour;
      ctx.fillStyle = colour;
      ctx.globalAlpha = 0.35;
      ctx.lineWidth = 1;
      ctx.beginPath();
      ctx.moveTo(sx, sy);
      ctx.lineTo(gx, gy);
      ctx.stroke();
      ctx.globalAlpha = 1;
      ctx.beginPath();
      ctx.arc(sx, sy, radius, 0, 2 * Math.PI);
      ctx.fill();
      ctx.lineWidth = Math.max(1.5, radius / 3);
      ctx.beginPath();
      ctx.arc(gx, gy, radius, 0, 2 * Math.PI);
      ctx.stroke();
    });
  }
}
