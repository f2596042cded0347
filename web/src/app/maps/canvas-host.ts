/**
 * The one door to the 2D canvas API. jsdom (component tests) has no canvas: tests provide a
 * CanvasHost whose context2d answers null, and every drawing routine then does nothing.
 */
import { Injectable } from '@angular/core';
import { parseCssRgb, type MapPalette, type Rgb } from './map-bitmap';

/** Creates canvases and contexts, and reads theme colours for pixel painting. */
@Injectable({ providedIn: 'root' })
export class CanvasHost {
  /** The 2D context of a canvas, or null where there is none. */
  context2d(canvas: HTMLCanvasElement): CanvasRenderingContext2D | null {
    return canvas.getContext('2d');
  }

  /**
   * The map palette from the theme, read through computed styles because pixels need numbers,
   * not `var(--mat-sys-*)` names.
   */
  palette(host: HTMLElement): MapPalette {
    const read = (cssVar: string, fallback: Rgb): Rgb => {
      const probe = document.createElement('span');
      probe.style.color = `var(${cssVar})`;
      probe.style.display = 'none';
      host.appendChild(probe);
      const rgb = parseCssRgb(getComputedStyle(probe).color);
      probe.remove();
      return rgb ?? fallback;
    };
    return {
      free: read('--mat-sys-surface-container-lowest', { r: 255, g: 255, b: 255 }),
      swamp: read('--mat-sys-secondary-container', { r: 200, g: 220, b: 220 }),
      blocked: read('--mat-sys-on-surface-variant', { r: 60, g: 70, b: 72 }),
    };
  }
}
