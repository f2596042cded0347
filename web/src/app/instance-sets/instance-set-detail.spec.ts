import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import type { DeletionPreview, InstanceSetDetail, UploadProblem } from '@shared/instance-sets';
import { CanvasHost } from '../maps/canvas-host';
import InstanceSetDetailPage from './instance-set-detail';

const SET: InstanceSetDetail = {
  id: 5, name: 'Gull Quay depot', description: 'Shelves by the water', visibility: 'public', source: 'invented',
  owner: { id: 3, login: 'wren', displayName: 'Wren Okafor' }, mapCount: 0, scenarioCount: 0,
  createdAt: '2026-05-01T08:00:00.000Z', updatedAt: '2026-05-01T08:00:00.000Z', maps: [], scenarios: [], canManage: true,
};

describe('InstanceSetDetailPage', () => {
  let fixture: ComponentFixture<InstanceSetDetailPage>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [InstanceSetDetailPage],
      providers: [
        provideHttpClient(), provideHttpClientTesting(), provideRouter([]),
        // Without animations a dialog closes at once, so afterClosed() fires within the test.
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: CanvasHost, useValue: { context2d: () => null, palette: () => null } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InstanceSetDetailPage);
    fixture.componentRef.setInput('id', '5');
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    backend.expectOne('/api/instance-sets/5').flush(SET);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  /** Lets promise continuations (a caught refusal, a closed dialog) run and the views update. */
  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  /**
   * Clicks a button without a harness: the harness waits for stability, which the dialog's pending
   * preview request would hold off until the test answers it.
   */
  async function press(selector: string): Promise<void> {
    (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>(selector)!.click();
    TestBed.tick();
    await new Promise((resolve) => setTimeout(resolve));
  }

  async function pick(...names: string[]): Promise<void> {
    const input = fixture.nativeElement.querySelector('input[type=file]') as HTMLInputElement;
    Object.defineProperty(input, 'files', { value: names.map((n) => new File(['type octile'], n)), configurable: true });
    input.dispatchEvent(new Event('change'));
    await fixture.whenStable();
  }

  it('posts the picked files as multipart and shows the upload progress', async () => {
    await pick('a.map', 'a-1.scen');
    const req = backend.expectOne({ method: 'POST', url: '/api/instance-sets/5/files' });
    expect((req.request.body as FormData).getAll('files').map((f) => (f as File).name)).toEqual(['a.map', 'a-1.scen']);
    expect(req.request.reportProgress).toBe(true);

    req.event({ type: HttpEventType.UploadProgress, loaded: 300, total: 1200 });
    await fixture.whenStable();
    expect(await (await loader.getHarness(MatProgressBarHarness.with({ selector: '[aria-label="Upload progress"]' }))).getValue()).toBe(25);
    expect(fixture.nativeElement.textContent).toContain('Sending 2 files… 25%');

    req.flush({ maps: [{ id: 1 }], scenarios: [{ id: 2 }], skipped: [] });
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[role=status]').textContent).toMatch(/Stored 1 map and\s+1 scenario\./);
    backend.expectOne('/api/instance-sets/5').flush(SET);
  });

  it('lists every problem of a refused upload by file, line and column', async () => {
    await pick('broken.map');
    const problems: UploadProblem[] = [
      { file: 'broken.map', line: 7, column: 5, message: "unexpected character 'x'" },
      { file: 'bundle.zip', line: 0, column: 0, message: 'the archive holds more than 1000 entries' },
    ];
    backend.expectOne('/api/instance-sets/5/files').flush(
      { error: { code: 'INVALID_INSTANCE_FILES', message: 'Nothing was stored: 2 problems in 2 files.', details: problems } },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();

    const table = await loader.getHarness(MatTableHarness.with({ selector: '[aria-label="Upload problems"]' }));
    const cells = await table.getCellTextByColumnName();
    expect(cells['file'].text).toEqual(['broken.map', 'bundle.zip']);
    expect(cells['place'].text).toEqual(['line 7, column 5', 'whole file']);
    expect(cells['message'].text).toEqual(["unexpected character 'x'", 'the archive holds more than 1000 entries']);
    expect(fixture.nativeElement.querySelector('[role=alert]').textContent).toContain('Nothing was stored');
  });

  it('changes the name in a dialog, sends only what changed and shows a refusal under the name field', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Change name, description or visibility' }))).click();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const dialog = await root.getHarness(MatDialogHarness);
    const name = await dialog.getHarness(MatInputHarness.with({ selector: '[formControlName=name]' }));
    expect(await name.getValue()).toBe('Gull Quay depot');
    await name.setValue('Ward corridors');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Save changes' }))).click();

    const req = backend.expectOne({ method: 'PATCH', url: '/api/instance-sets/5' });
    expect(req.request.body).toEqual({ name: 'Ward corridors' });
    const message = 'You already have an instance set named "Ward corridors"; choose another name.';
    req.flush({ error: { code: 'CONFLICT', message, details: [{ path: ['name'], code: 'taken', message }] } }, { status: 409, statusText: 'Conflict' });
    await settle();
    expect(document.querySelector('mat-dialog-container mat-error')?.textContent?.trim()).toBe(message);

    await name.setValue('Gull Quay harbour');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Save changes' }))).click();
    const again = backend.expectOne({ method: 'PATCH', url: '/api/instance-sets/5' });
    expect(again.request.body).toEqual({ name: 'Gull Quay harbour' });
    again.flush({ ...SET, name: 'Gull Quay harbour' });
    await settle();
    // Closed with the changed set: the page asks for the set again.
    backend.expectOne('/api/instance-sets/5').flush({ ...SET, name: 'Gull Quay harbour' });
    await fixture.whenStable();
    expect(await root.getAllHarnesses(MatDialogHarness)).toHaveLength(0);
    expect((fixture.nativeElement as HTMLElement).querySelector('h1')?.textContent).toContain('Gull Quay harbour');
  });

  describe('deleting one file', () => {
    const WITH_FILES: InstanceSetDetail = {
      ...SET, mapCount: 1, scenarioCount: 1,
      maps: [{ id: 11, instanceSetId: 5, name: 'quay.map', width: 8, height: 8, passableCount: 60, checksum: 'a'.repeat(64), byteSize: 100 }],
      scenarios: [{ id: 21, instanceSetId: 5, mapId: 11, name: 'quay-1.scen', rowCount: 10, maxAgents: 10, checksum: 'b'.repeat(64), byteSize: 200 }],
    };

    beforeEach(async () => {
      // Reload the page with one map and one scenario.
      fixture = TestBed.createComponent(InstanceSetDetailPage);
      fixture.componentRef.setInput('id', '5');
      loader = TestbedHarnessEnvironment.loader(fixture);
      await fixture.whenStable();
      backend.expectOne('/api/instance-sets/5').flush(WITH_FILES);
      await fixture.whenStable();
      backend.expectOne('/api/maps/11').flush({ ...WITH_FILES.maps[0], type: 'octile', rows: Array(8).fill('.'.repeat(8)), scenarios: [] });
      await fixture.whenStable();
    });

    it('names every column of the scenario table, the button columns for screen readers', () => {
      const headers = [...(fixture.nativeElement as HTMLElement).querySelectorAll('table[aria-label="Scenarios"] th')].map((th) => th.textContent?.trim());
      expect(headers).toEqual(['Scenario', 'Map', 'Rows', 'Largest k', 'File', 'Delete']);
    });

    it('says what goes with a scenario, and deletes it only after the confirmation', async () => {
      await press('[aria-label="Delete scenario quay-1.scen"]');
      const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
      const preview: DeletionPreview = { kind: 'scenario', id: 21, name: 'quay-1.scen', maps: 0, scenarios: 0, runs: 4, results: 3, submissions: 1, sweeps: 1 };
      backend.expectOne({ method: 'GET', url: '/api/scenarios/21/deletion-preview' }).flush(preview);
      await fixture.whenStable();
      const dialog = await root.getHarness(MatDialogHarness);
      const items = [...document.querySelectorAll('mat-dialog-container [aria-label="Deleted with it"] li')].map((li) => li.textContent?.trim());
      expect(items).toEqual([
        '3 stored results (1 of them submitted plan), with their execution replays and leaderboard entries',
        '4 runs of 1 sweep; the sweep stays with fewer runs',
      ]);
      expect(await dialog.getTitleText()).toBe('Delete scenario “quay-1.scen”?');
      await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete scenario' }))).click();
      await settle();
      backend.expectOne({ method: 'DELETE', url: '/api/scenarios/21' }).flush(null, { status: 204, statusText: 'No Content' });
      await settle();
      backend.expectOne('/api/instance-sets/5').flush({ ...WITH_FILES, scenarioCount: 0, scenarios: [] });
      await fixture.whenStable();
      backend.expectOne('/api/maps/11').flush({ ...WITH_FILES.maps[0], type: 'octile', rows: Array(8).fill('.'.repeat(8)), scenarios: [] });
      await fixture.whenStable();
      expect((fixture.nativeElement as HTMLElement).querySelector('[role=status]')?.textContent).toContain('Deleted scenario quay-1.scen.');
    });

    it('says what goes with the whole set before deleting it', async () => {
      await press('.danger button');
      backend.expectOne('/api/instance-sets/5/deletion-preview').flush({
        kind: 'set', id: 5, name: 'Gull Quay depot', maps: 1, scenarios: 1, runs: 0, results: 2, submissions: 0, sweeps: 0,
      } satisfies DeletionPreview);
      await fixture.whenStable();
      const dialog = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
      expect(await dialog.getTitleText()).toBe('Delete instance set “Gull Quay depot”?');
      const items = [...document.querySelectorAll('mat-dialog-container [aria-label="Deleted with it"] li')].map((li) => li.textContent?.trim());
      expect(items).toEqual(['its 1 map', 'its 1 scenario', '2 stored results, with their execution replays and leaderboard entries']);
      await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete instance set' }))).click();
      await settle();
      backend.expectOne({ method: 'DELETE', url: '/api/instance-sets/5' }).flush(null, { status: 204, statusText: 'No Content' });
      await settle();
    });

    it('deletes nothing when the person keeps the map', async () => {
      await press('[aria-label="Delete map quay.map"]');
      backend.expectOne('/api/maps/11/deletion-preview').flush({ kind: 'map', id: 11, name: 'quay.map', maps: 0, scenarios: 1, runs: 0, results: 0, submissions: 0, sweeps: 0 } satisfies DeletionPreview);
      await fixture.whenStable();
      const dialog = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
      expect(document.querySelector('mat-dialog-container [aria-label="Deleted with it"]')?.textContent?.trim()).toBe('its 1 scenario');
      await (await dialog.getHarness(MatButtonHarness.with({ text: 'Keep it' }))).click();
      await fixture.whenStable();
      // backend.verify() in afterEach fails on any DELETE that went out.
      expect(await TestbedHarnessEnvironment.documentRootLoader(fixture).getAllHarnesses(MatDialogHarness)).toHaveLength(0);
    });
  });
});
