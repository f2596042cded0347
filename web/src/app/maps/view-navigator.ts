/**
 * Zoom and pan of a canvas that shows a grid map, shared by the map viewer and the plan viewer's
 * fleet replay: the view transform as a signal (map-view-math.ts), the whole-map fit, zoom by
 * buttons, wheel (about the pointer) and keys, and pan by drag and arrow keys. Drawing stays with
 * each canvas; it reads `view()` and redraws when it changes.
 */
import { computed, signal } from '@angular/core';
import { fitTransform, panBy, scaleLimits, wheelFactor, zoomAt, type ViewTransform } from './map-view-math';

/** Zoom factor of the + and − buttons and keys. */
export const BUTTON_ZOOM = 1.5;
/** Canvas pixels an arrow key pans. */
const KEY_PAN_PX = 40;

/** The view of one map canvas. */
export class ViewNavigator {
  /** Cell → canvas pixels. */
  readonly view = signal<ViewTransform>({ scale: 1, offsetX: 0, offsetY: 0 });
  /** CSS size of the canvas's content box. */
  readonly viewSize = signal<readonly [number, number]>([0, 0]);
  /** The transform that shows the whole map. */
  readonly fitted = computed(() => {
    const [w, h] = this.mapSize();
    return fitTransform(w, h, this.viewSize()[0] || 1, this.viewSize()[1] || 1);
  });
  /** The zoom readout. */
  readonly zoomText = computed(() => `${Math.round(this.view().scale * 100) / 100} px per cell`);
  private drag: { x: number; y: number } | null = null;

  /**
   * `mapSize`: the map's width and height in cells. `start`: the view a new map (or the first
   * layout) opens with, from the fitted one (default: the whole map).
   */
  constructor(
    private readonly mapSize: () => readonly [number, number],
    private readonly start: (fitted: ViewTransform, viewSize: readonly [number, number]) => ViewTransform = (f) => f,
  ) {}

  /** Whether a drag is in progress. */
  get isDragging(): boolean {
    return this.drag !== null;
  }

  /** Records a new canvas size; the first one (or `reset`) also sets the start view. */
  resize(width: number, height: number, reset = false): void {
    const isFirst = this.viewSize()[0] === 0;
    this.viewSize.set([width, height]);
    if (isFirst || reset) this.reset();
  }

  /** Back to the start view (a new map). */
  reset(): void {
    this.view.set(this.start(this.fitted(), this.viewSize()));
  }

  /** Shows the whole map. */
  fit(): void {
    this.view.set(this.fitted());
  }

  /** Zooms about the centre of the canvas. */
  zoomBy(factor: number): void {
    const [w, h] = this.viewSize();
    this.zoomAbout(factor, w / 2, h / 2);
  }

  /** Zooms by `factor` about canvas point (px, py), within the map's scale limits. */
  zoomAbout(factor: number, px: number, py: number): void {
    const limits = scaleLimits(this.fitted());
    this.view.update((t) => zoomAt(t, factor, px, py, limits));
  }

  /** Wheel zoom about the pointer at canvas point `at`. */
  zoomWithWheel(event: WheelEvent, at: readonly [number, number]): void {
    event.preventDefault();
    this.zoomAbout(wheelFactor(event.deltaY), at[0], at[1]);
  }

  startDrag(event: PointerEvent): void {
    this.drag = { x: event.clientX, y: event.clientY };
    (event.target as Element).setPointerCapture?.(event.pointerId);
  }

  /** Pans while dragging. */
  dragTo(event: PointerEvent): void {
    if (!this.drag) return;
    const dx = event.clientX - this.drag.x;
    const dy = event.clientY - this.drag.y;
    this.drag = { x: event.clientX, y: event.clientY };
    this.view.update((t) => panBy(t, dx, dy));
  }

  endDrag(event: PointerEvent): void {
    this.drag = null;
    (event.target as Element).releasePointerCapture?.(event.pointerId);
  }

  /** Arrow keys pan, + and − zoom, 0 fits: the canvas is usable without a pointer. Answers whether the key was used. */
  handleKey(event: KeyboardEvent): boolean {
    const moves: Record<string, () => void> = {
      ArrowLeft: () => this.view.update((t) => panBy(t, KEY_PAN_PX, 0)),
      ArrowRight: () => this.view.update((t) => panBy(t, -KEY_PAN_PX, 0)),
      ArrowUp: () => this.view.update((t) => panBy(t, 0, KEY_PAN_PX)),
      ArrowDown: () => this.view.update((t) => panBy(t, 0, -KEY_PAN_PX)),
      '+': () => this.zoomBy(BUTTON_ZOOM),
      '=': () => this.zoomBy(BUTTON_ZOOM),
      '-': () => this.zoomBy(1 / BUTTON_ZOOM),
      '0': () => this.fit(),
    };
    const move = moves[event.key];
    if (!move) return false;
    event.preventDefault();
    move();
    return true;
  }
}

/** The canvas point of a pointer event, relative to the canvas's content box (inside its border). */
export function canvasPoint(canvas: HTMLCanvasElement, event: MouseEvent): readonly [number, number] {
  const box = canvas.getBoundingClientRect();
  return [event.clientX - box.left - canvas.clientLeft, event.clientY - box.top - canvas.clientTop];
}
