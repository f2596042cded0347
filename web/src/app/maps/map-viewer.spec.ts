import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatSelectHarness } from '@angular/material/select/testing';
import { By } from '@angular/platform-browser';
import { provideRouter } from '@angular/router';
import type { MapDetail, ScenarioDetail } from '@shared/instance-sets';
import { CanvasHost } from './canvas-host';
import { MapCanvas } from './map-canvas';
import MapViewer from './map-viewer';

const MAP: MapDetail = {
  id: 4, instanceSetId: 5, name: 'tiny.map', width: 3, height: 2, passableCount: 5, checksum: 'c', byteSize: 40, type: 'octile',
  rows: ['..@', '...'],
  scenarios: [{ id: 8, instanceSetId: 5, mapId: 4, name: 'tiny-1.scen', rowCount: 2, maxAgents: 2, checksum: 'd', byteSize: 60 }],
};
const SCENARIO: ScenarioDetail = {
  ...MAP.scenarios[0], mapName: 'tiny.map',
  rows: [{ bucket: 0, start: [0, 0], goal: [2, 1], optimalLength: 2.41421356 }, { bucket: 0, start: [1, 1], goal: [0, 1], optimalLength: 1 }],
};

describe('MapViewer', () => {
  let fixture: ComponentFixture<MapViewer>;
  let backend: HttpTestingController;
  const readout = () => (fixture.nativeElement.querySelector('[data-testid=hover-readout]') as HTMLElement).textContent?.trim();
  const hover = async (cell: readonly [number, number] | null) => {
    (fixture.debugElement.query(By.directive(MapCanvas)).componentInstance as MapCanvas).hoverCell.emit(cell);
    await fixture.whenStable();
  };

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [MapViewer],
      // jsdom has no canvas: the host answers no context, so drawing is skipped.
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: CanvasHost, useValue: { context2d: () => null, palette: () => null } }],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MapViewer);
    fixture.componentRef.setInput('id', '5');
    fixture.componentRef.setInput('mapId', '4');
    await fixture.whenStable();
    backend.expectOne('/api/maps/4').flush(MAP);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  it('shows the map facts and reads out the hovered cell and its terrain', async () => {
    expect(fixture.nativeElement.querySelector('h1').textContent).toBe('tiny.map');
    expect(readout()).toBe('Point at the map, or press Shift and an arrow key on it, to read a cell.');
    await hover([2, 0]);
    expect(readout()).toBe('x 2, y 0 · blocked');
    await hover([1, 1]);
    expect(readout()).toBe('x 1, y 1 · free');
  });

  it('reads out a cursor cell moved with Shift and the arrow keys, without a pointer', async () => {
    const canvas = fixture.nativeElement.querySelector('canvas') as HTMLCanvasElement;
    const press = async (key: string, shiftKey = true) => {
      canvas.dispatchEvent(new KeyboardEvent('keydown', { key, shiftKey, bubbles: true, cancelable: true }));
      await fixture.whenStable();
    };
    // jsdom lays nothing out (a 0 × 0 view), so the cursor starts at the middle cell of the 3 × 2 map.
    await press('ArrowRight');
    expect(readout()).toBe('x 1, y 1 · free');
    await press('ArrowUp');
    await press('ArrowRight');
    expect(readout()).toBe('x 2, y 0 · blocked');
    await press('ArrowRight');
    expect(readout()).toBe('x 2, y 0 · blocked');
    await press('Escape', false);
    expect(readout()).toBe('Point at the map, or press Shift and an arrow key on it, to read a cell.');
  });

  it('overlays the first k rows of the chosen scenario', async () => {
    const select = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatSelectHarness);
    await select.open();
    await select.clickOptions({ text: 'tiny-1.scen' });
    backend.expectOne('/api/scenarios/8').flush(SCENARIO);
    await fixture.whenStable();

    const canvas = fixture.debugElement.query(By.directive(MapCanvas)).componentInstance as MapCanvas;
    expect(canvas.markers()).toEqual([{ start: [0, 0], goal: [2, 1] }, { start: [1, 1], goal: [0, 1] }]);
    await hover([0, 1]);
    expect(readout()).toBe('x 0, y 1 · free · goal of agent 2');

    const k = fixture.nativeElement.querySelector('input[type=number]') as HTMLInputElement;
    k.value = '1';
    k.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(canvas.markers()).toEqual([{ start: [0, 0], goal: [2, 1] }]);
  });
});
