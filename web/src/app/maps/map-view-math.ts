/**
 * The pure geometry of the map viewer: a view transform maps cell coordinates to canvas pixels
 * as `pixel = cell · scale + offset`, so panning changes the offset and zooming changes the
 * scale about a fixed point. Kept apart from the canvas so it can be tested without one.
 */

/** Canvas pixels per cell (`scale`) and the canvas position of cell corner (0, 0). */
export interface ViewTransform {
  readonly scale: number;
  readonly offsetX: number;
  readonly offsetY: number;
}

/** Smallest and largest scale allowed, in canvas pixels per cell. */
export interface ScaleLimits {
  readonly min: number;
  readonly max: number;
}

/** The most a cell may be enlarged: a few cells fill a normal screen. */
export const MAX_CELL_PIXELS = 96;

/** The transform that shows the whole map centred in a view of viewWidth × viewHeight pixels. */
export function fitTransform(mapWidth: number, mapHeight: number, viewWidth: number, viewHeight: number, margin = 8): ViewTransform {
  const scale = Math.max(Math.min((viewWidth - 2 * margin) / mapWidth, (viewHeight - 2 * margin) / mapHeight), 1e-3);
  return { scale, offsetX: (viewWidth - mapWidth * scale) / 2, offsetY: (viewHeight - mapHeight * scale) / 2 };
}

/** Scale limits for a map in a view: from a quarter of the fitted size up to MAX_CELL_PIXELS. */
export function scaleLimits(fitted: ViewTransform): ScaleLimits {
  return { min: fitted.scale / 4, max: Math.max(MAX_CELL_PIXELS, fitted.scale) };
}

/** Zooms by `factor` about canvas point (px, py), which stays over the same map point; the scale is clamped. */
export function zoomAt(t: ViewTransform, factor: number, px: number, py: number, limits: ScaleLimits): ViewTransform {
  const scale = Math.min(limits.max, Math.max(limits.min, t.scale * factor));
  const k = scale / t.scale;
  return { scale, offsetX: px - (px - t.offsetX) * k, offsetY: py - (py - t.offsetY) * k };
}

/** Moves the view by (dx, dy) canvas pixels. */
export function panBy(t: ViewTransform, dx: number, dy: number): ViewTransform {
  return { scale: t.scale, offsetX: t.offsetX + dx, offsetY: t.offsetY + dy };
}

/** The [x, y] cell under canvas point (px, py), or null outside the map. */
export function cellAt(t: ViewTransform, px: number, py: number, mapWidth: number, mapHeight: number): readonly [number, number] | null {
  const x = Math.floor((px - t.offsetX) / t.scale);
  const y = Math.floor((py - t.offsetY) / t.scale);
  return x >= 0 && y >= 0 && x < mapWidth && y < mapHeight ? [x, y] : null;
}

/** The canvas position of the centre of cell (x, y). */
export function cellCentre(t: ViewTransform, x: number, y: number): readonly [number, number] {
  return [t.offsetX + (x + 0.5) * t.scale, t.offsetY + (y + 0.5) * t.scale];
}

/** The zoom factor of one wheel event: 1.2 per notch (100 delta units), out for positive deltaY. */
export function wheelFactor(deltaY: number): number {
  return Math.pow(1.2, -Math.max(-5, Math.min(5, deltaY / 100)));
}

/** Cursor steps of the arrow keys, [dx, dy] in cells. */
const CURSOR_STEPS: Readonly<Record<string, readonly [number, number]>> = {
  ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, -1], ArrowDown: [0, 1],
};

/**
 * The keyboard cursor cell after arrow key `key`: one cell in that direction, kept on the map; a
 * cursor not placed yet starts at `start`. Null for a key that is no arrow.
 */
export function stepCursor(cursor: readonly [number, number] | null, key: string, start: readonly [number, number], mapWidth: number, mapHeight: number): readonly [number, number] | null {
  const step = CURSOR_STEPS[key];
  if (!step) return null;
  if (!cursor) return start;
  return [Math.max(0, Math.min(mapWidth - 1, cursor[0] + step[0])), Math.max(0, Math.min(mapHeight - 1, cursor[1] + step[1]))];
}

/** The view panned just enough that cell (x, y) lies wholly inside a view of viewWidth × viewHeight pixels. */
export function keepCellInView(t: ViewTransform, x: number, y: number, viewWidth: number, viewHeight: number): ViewTransform {
  const left = t.offsetX + x * t.scale;
  const top = t.offsetY + y * t.scale;
  const dx = left < 0 ? -left : left + t.scale > viewWidth ? viewWidth - (left + t.scale) : 0;
  const dy = top < 0 ? -top : top + t.scale > viewHeight ? viewHeight - (top + t.scale) : 0;
  return dx === 0 && dy === 0 ? t : panBy(t, dx, dy);
}
