import { fitTransform } from './map-view-math';
import { BUTTON_ZOOM, ViewNavigator } from './view-navigator';

describe('ViewNavigator (zoom and pan shared by the map and fleet canvases)', () => {
  const pointer = (x: number, y: number) => ({ clientX: x, clientY: y, pointerId: 1, target: {} }) as unknown as PointerEvent;
  const key = (k: string) => ({ key: k, preventDefault: jest.fn() }) as unknown as KeyboardEvent;

  it('opens at its start view, pans by drag and arrow keys, zooms by keys and fits again', () => {
    const nav = new ViewNavigator(() => [20, 10], (f) => ({ ...f, scale: f.scale * 2 }));
    nav.resize(400, 200);
    const fitted = fitTransform(20, 10, 400, 200);
    expect(nav.view().scale).toBe(fitted.scale * 2);
    const before = nav.view();
    nav.startDrag(pointer(10, 10));
    nav.dragTo(pointer(40, 25));
    nav.endDrag(pointer(40, 25));
    nav.dragTo(pointer(90, 90)); // no drag in progress: no move
    expect([nav.view().offsetX - before.offsetX, nav.view().offsetY - before.offsetY]).toEqual([30, 15]);
    expect(nav.handleKey(key('ArrowLeft'))).toBe(true);
    expect(nav.view().offsetX - before.offsetX).toBe(70);
    const scale = nav.view().scale;
    nav.handleKey(key('-'));
    expect(nav.view().scale).toBeCloseTo(scale / BUTTON_ZOOM, 9);
    expect(nav.handleKey(key('x'))).toBe(false);
    nav.handleKey(key('0'));
    expect(nav.view()).toEqual(fitted);
    // A later resize keeps the view; a reset goes back to the start view.
    nav.resize(500, 200);
    expect(nav.view()).toEqual(fitted);
    nav.resize(500, 200, true);
    expect(nav.view().scale).toBe(fitTransform(20, 10, 500, 200).scale * 2);
  });
});
