import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import type { InstanceSetDetail, UploadProblem } from '@shared/instance-sets';
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
});
