/**
 * The fleet canvas on large maps (issue 14, item 7): a 161×63 warehouse opens at a readable cell
 * size, not squeezed into the pane, and zooms and pans like the map viewer (shared ViewNavigator).
 */
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import type { ExecutionInstanceView } from '@shared/executions';
import { fitTransform } from '../maps/map-view-math';
import { CONTEXT_2D } from './canvas-context';
import { READABLE_CELL_PX, FleetCanvas, fleetCanvasSize, startView } from './fleet-canvas';
import { TEST_PROFILE } from './plan-viewer-testing';
import { ReplayClock } from './replay-clock';

/** An invented 161×63 floor, all free, two robots. */
const WAREHOUSE: ExecutionInstanceView = {
  width: 161, height: 63, rows: Array.from({ length: 63 }, () => '.'.repeat(161)),
  agents: [{ start: [0, 0], goal: [160, 62] }, { start: [5, 5], goal: [100, 30] }],
};

describe('fleet canvas geometry', () => {
  it('keeps a flat map at least 260 px high and a small one square', () => {
    expect(fleetCanvasSize(161, 63, 620)).toEqual({ w: 620, h: 260 });
    expect(fleetCanvasSize(8, 8, 620)).toEqual({ w: 620, h: 620 });
  });

  it('opens a large map at the readable cell size about its centre, a small one whole', () => {
    const fitted = fitTransform(161, 63, 620, 260);
    // The whole warehouse would give under 4 px per cell, the old 340×130 px drawing's problem.
    expect(fitted.scale).toBeLessThan(4);
    const start = startView(fitted, [620, 260]);
    expect(start.scale).toBe(READABLE_CELL_PX);
    // The centre of the view shows the centre of the map.
    expect((310 - start.offsetX) / start.scale).toBeCloseTo(80.5, 6);
    expect((130 - start.offsetY) / start.scale).toBeCloseTo(31.5, 6);
    const small = fitTransform(8, 8, 620, 620);
    expect(startView(small, [620, 620])).toEqual(small);
  });
});

describe('FleetCanvas', () => {
  it('zooms with its buttons and shows the whole map on request, the readout in px per cell', async () => {
    TestBed.configureTestingModule({ imports: [FleetCanvas], providers: [{ provide: CONTEXT_2D, useValue: () => null }] });
    const fixture = TestBed.createComponent(FleetCanvas);
    const clock = new ReplayClock();
    fixture.componentRef.setInput('instance', WAREHOUSE);
    fixture.componentRef.setInput('profile', TEST_PROFILE);
    fixture.componentRef.setInput('clock', clock);
    fixture.componentRef.setInput('maxPx', 620);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const readout = () => el.querySelector('[data-testid="fleet-zoom"]')?.textContent?.trim();
    const canvas = el.querySelector('canvas')!;
    expect([canvas.style.width, canvas.style.height]).toEqual(['620px', '260px']);
    expect(readout()).toBe('8 px per cell');
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Zoom in"]' }))).click();
    expect(readout()).toBe('12 px per cell');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Whole map' }))).click();
    const whole = fitTransform(161, 63, 620, 260).scale;
    expect(readout()).toBe(`${Math.round(whole * 100) / 100} px per cell`);
    canvas.dispatchEvent(new KeyboardEvent('keydown', { key: '+' }));
    await fixture.whenStable();
    expect(readout()).toBe(`${Math.round(whole * 1.5 * 100) / 100} px per cell`);
    clock.destroy();
  });
});
