import { cellAt, cellCentre, fitTransform, keepCellInView, panBy, scaleLimits, stepCursor, wheelFactor, zoomAt } from './map-view-math';

describe('map view geometry', () => {
  it('fits a map centred with a margin, limited by the tighter side', () => {
    // 1024 × 512 map in a 1040 × 800 view: width limits, (1040 − 16) / 1024 = 1 pixel per cell.
    const t = fitTransform(1024, 512, 1040, 800);
    expect(t).toEqual({ scale: 1, offsetX: 8, offsetY: (800 - 512) / 2 });
  });

  it('finds the cell under a point, and null off the map', () => {
    const t = { scale: 10, offsetX: 5, offsetY: 20 };
    expect(cellAt(t, 5, 20, 8, 8)).toEqual([0, 0]);
    expect(cellAt(t, 84.9, 99.9, 8, 8)).toEqual([7, 7]);
    expect(cellAt(t, 85, 50, 8, 8)).toBeNull();
    expect(cellAt(t, 4.9, 50, 8, 8)).toBeNull();
  });

  it('keeps the map point under the pointer fixed while zooming', () => {
    const t = { scale: 4, offsetX: 13, offsetY: -7 };
    const z = zoomAt(t, 2.5, 100, 60, { min: 0.1, max: 100 });
    // The map point under (100, 60) before: ((100 − 13) / 4, (60 + 7) / 4); after it must map back to (100, 60).
    const [mx, my] = [(100 - 13) / 4, (60 + 7) / 4];
    expect(z.scale).toBe(10);
    expect(mx * z.scale + z.offsetX).toBeCloseTo(100, 9);
    expect(my * z.scale + z.offsetY).toBeCloseTo(60, 9);
  });

  it('clamps the scale to its limits', () => {
    const limits = scaleLimits(fitTransform(32, 32, 528, 528));
    expect(limits).toEqual({ min: 4, max: 96 });
    expect(zoomAt({ scale: 90, offsetX: 0, offsetY: 0 }, 10, 0, 0, limits).scale).toBe(96);
    expect(zoomAt({ scale: 5, offsetX: 0, offsetY: 0 }, 0.01, 0, 0, limits).scale).toBe(4);
  });

  it('pans by screen pixels and places cell centres half a cell in', () => {
    const t = panBy({ scale: 8, offsetX: 0, offsetY: 0 }, 3, -4);
    expect(t).toEqual({ scale: 8, offsetX: 3, offsetY: -4 });
    expect(cellCentre(t, 2, 1)).toEqual([3 + 20, -4 + 12]);
  });

  it('zooms in for wheel up, out for wheel down, 1.2 per notch, bounded per event', () => {
    expect(wheelFactor(-100)).toBeCloseTo(1.2, 12);
    expect(wheelFactor(100)).toBeCloseTo(1 / 1.2, 12);
    expect(wheelFactor(-100000)).toBeCloseTo(Math.pow(1.2, 5), 9);
  });
});

describe('keyboard cursor cell', () => {
  it('starts where it is told, then moves one cell per arrow key and stays on the map', () => {
    expect(stepCursor(null, 'ArrowRight', [2, 1], 4, 3)).toEqual([2, 1]);
    expect(stepCursor([2, 1], 'ArrowRight', [0, 0], 4, 3)).toEqual([3, 1]);
    expect(stepCursor([3, 1], 'ArrowRight', [0, 0], 4, 3)).toEqual([3, 1]);
    expect(stepCursor([0, 0], 'ArrowUp', [0, 0], 4, 3)).toEqual([0, 0]);
    expect(stepCursor([0, 0], 'ArrowLeft', [0, 0], 4, 3)).toEqual([0, 0]);
    expect(stepCursor([1, 2], 'ArrowDown', [0, 0], 4, 3)).toEqual([1, 2]);
    expect(stepCursor([1, 1], 'ArrowDown', [0, 0], 4, 3)).toEqual([1, 2]);
    expect(stepCursor([1, 1], 'Enter', [0, 0], 4, 3)).toBeNull();
  });

  it('pans the view only as far as needed to show the cursor cell whole', () => {
    const t = { scale: 10, offsetX: 0, offsetY: 0 };
    expect(keepCellInView(t, 3, 3, 100, 100)).toBe(t);
    // Cell 12 spans 120..130 px: the view moves left by 30 px so it ends at the right edge.
    expect(keepCellInView(t, 12, 0, 100, 100)).toEqual({ scale: 10, offsetX: -30, offsetY: 0 });
    expect(keepCellInView({ scale: 10, offsetX: -50, offsetY: -50 }, 2, 1, 100, 100)).toEqual({ scale: 10, offsetX: -20, offsetY: -10 });
  });
});
