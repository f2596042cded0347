/**
 * Paints a map's terrain rows into RGBA pixels, one pixel per cell, for ImageData. Done once per
 * map, so the viewer only scales one bitmap while panning and zooming (a 1024 × 1024 map is
 * 4 MB of pixels and never redrawn cell by cell).
 */

/** An opaque colour. */
export interface Rgb {
  readonly r: number;
  readonly g: number;
  readonly b: number;
}

/** The colours of the three cell kinds. */
export interface MapPalette {
  /** Ground: `.` and `G`. */
  readonly free: Rgb;
  /** Swamp `S`: passable, shown apart. */
  readonly swamp: Rgb;
  /** Everything else: `@`, `O`, `T`, `W`. */
  readonly blocked: Rgb;
}

/** RGBA pixels (width × height × 4 bytes, row by row) of the terrain rows. */
export function paintMap(rows: readonly string[], width: number, height: number, palette: MapPalette): Uint8ClampedArray {
  const pixels = new Uint8ClampedArray(width * height * 4);
  for (let y = 0; y < height; y++) {
    const row = rows[y] ?? '';
    for (let x = 0; x < width; x++) {
      const ch = row.charCodeAt(x);
      // '.' 46, 'G' 71 are ground; 'S' 83 is swamp; anything else blocks.
      const c = ch === 46 || ch === 71 ? palette.free : ch === 83 ? palette.swamp : palette.blocked;
      const i = (y * width + x) * 4;
      pixels[i] = c.r;
      pixels[i + 1] = c.g;
      pixels[i + 2] = c.b;
      pixels[i + 3] = 255;
    }
  }
  return pixels;
}

/** Whether the cell at (x, y) of terrain rows is passable (`.`, `G` or `S`). */
export function isPassableAt(rows: readonly string[], x: number, y: number): boolean {
  const ch = rows[y]?.[x];
  return ch === '.' || ch === 'G' || ch === 'S';
}

/** Parses `rgb(r, g, b)` / `rgba(r, g, b, a)` as the browser reports computed colours; null otherwise. */
export function parseCssRgb(text: string): Rgb | null {
  const m = /^rgba?\(\s*(\d+)[,\s]+(\d+)[,\s]+(\d+)/.exec(text.trim());
  return m ? { r: Number(m[1]), g: Number(m[2]), b: Number(m[3]) } : null;
}

/** A distinct colour per agent: hues a golden angle apart, so neighbours in the list differ clearly. */
export function agentColour(index: number): string {
  return `hsl(${(index * 137.508) % 360} 75% 42%)`;
}
