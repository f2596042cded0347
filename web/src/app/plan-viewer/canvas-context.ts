/**
 * How the plan viewer gets a 2D canvas context. jsdom (component tests) has no canvas, so tests
 * provide a factory answering null, and every drawing routine then does nothing.
 */
import { InjectionToken } from '@angular/core';

/** Makes the 2D context of a canvas, or null where there is none. */
export type Context2dFactory = (canvas: HTMLCanvasElement | OffscreenCanvas) => CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D | null;

/** The factory the viewer's canvases use. */
export const CONTEXT_2D = new InjectionToken<Context2dFactory>('plan viewer 2D context', {
  providedIn: 'root',
  factory: () => (canvas) => canvas.getContext('2d') as CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D | null,
});

/** A canvas of `w` × `h` px for drawing off screen (an OffscreenCanvas where available). */
export function offscreenCanvas(w: number, h: number): HTMLCanvasElement | OffscreenCanvas {
  if (typeof OffscreenCanvas === 'function') return new OffscreenCanvas(w, h);
  const c = document.createElement('canvas');
  c.width = w;
  c.height = h;
  return c;
}
