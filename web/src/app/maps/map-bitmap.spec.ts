import { isPassableAt, paintMap, parseCssRgb, type MapPalette } from './map-bitmap';

const PALETTE: MapPalette = { free: { r: 250, g: 251, b: 252 }, swamp: { r: 100, g: 150, b: 200 }, blocked: { r: 1, g: 2, b: 3 } };

describe('map bitmap', () => {
  it('paints one opaque RGBA pixel per cell, row by row, by terrain', () => {
    // Terrain letters of the grid map format (Sturtevant, IEEE TCIAIG 2012): . G ground, S swamp, @ O T W blocked.
    const pixels = paintMap(['.G@', 'STW'], 3, 2, PALETTE);
    const cell = (x: number, y: number) => Array.from(pixels.slice((y * 3 + x) * 4, (y * 3 + x) * 4 + 4));
    expect(pixels).toHaveLength(3 * 2 * 4);
    expect(cell(0, 0)).toEqual([250, 251, 252, 255]);
    expect(cell(1, 0)).toEqual([250, 251, 252, 255]);
    expect(cell(2, 0)).toEqual([1, 2, 3, 255]);
    expect(cell(0, 1)).toEqual([100, 150, 200, 255]);
    expect(cell(1, 1)).toEqual([1, 2, 3, 255]);
    expect(cell(2, 1)).toEqual([1, 2, 3, 255]);
  });

  it('tells passable cells', () => {
    expect([isPassableAt(['.@S'], 0, 0), isPassableAt(['.@S'], 1, 0), isPassableAt(['.@S'], 2, 0), isPassableAt(['.@S'], 0, 5)])
      .toEqual([true, false, true, false]);
  });

  it('reads computed colours as the browser writes them', () => {
    expect(parseCssRgb('rgb(3, 105, 113)')).toEqual({ r: 3, g: 105, b: 113 });
    expect(parseCssRgb('rgba(10, 20, 30, 0.5)')).toEqual({ r: 10, g: 20, b: 30 });
    expect(parseCssRgb('var(--x)')).toBeNull();
  });
});
