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
