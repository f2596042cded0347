import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { Router, provideRouter } from '@angular/router';
import type { InstanceSetListResponse, InstanceSetSummary } from '@shared/instance-sets';
import { Session } from '../core/session';
import InstanceSetList from './instance-set-list';

const summary = (id: number, name: string, visibility: 'public' | 'private'): InstanceSetSummary => ({
  id, name, visibility, description: '', source: '', owner: { id: 3, login: 'wren', displayName: 'Wren Okafor' },
  mapCount: id, scenarioCount: id * 5, createdAt: '2026-05-01T08:00:00.000Z', updatedAt: `2026-05-0${id}T08:00:00.000Z`,
});
const PAGE: InstanceSetListResponse = { items: [summary(1, 'Gull Quay depot', 'public'), summary(2, 'Ward corridors', 'private')], total: 2, page: 1, pageSize: 20 };

describe('InstanceSetList', () => {
  let fixture: ComponentFixture<InstanceSetList>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [InstanceSetList],
      providers: [
        provideHttpClient(), provideHttpClientTesting(), provideRouter([]),
        // Without animations the dialog closes at once, so afterClosed() fires within the test.
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: Session, useValue: { hasRole: (role: string) => role !== 'admin' } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InstanceSetList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    backend.expectOne('/api/instance-sets?page=1&pageSize=20').flush(PAGE);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  it('lists the sets of the page with owner, visibility and counts', async () => {
    const cells = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(cells['name'].text).toEqual(['Gull Quay depot', 'Ward corridors']);
    expect(cells['owner'].text).toEqual(['Wren Okafor', 'Wren Okafor']);
    expect(cells['visibility'].text).toEqual(['public', 'private']);
    expect(cells['scenarioCount'].text).toEqual(['5', '10']);
    expect(cells['updatedAt'].text).toEqual(['2026-05-01', '2026-05-02']);
  });

  it('sends the search text to the server after typing pauses, from the first page', async () => {
    const search = await loader.getHarness(MatInputHarness.with({ selector: '[type=search]' }));
    await search.setValue('quay');
    await new Promise((r) => setTimeout(r, 300));
    await fixture.whenStable();
    backend.expectOne('/api/instance-sets?page=1&pageSize=20&q=quay').flush({ ...PAGE, items: [PAGE.items[0]], total: 1 });
    await fixture.whenStable();
    expect((await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName())['name'].text).toEqual(['Gull Quay depot']);
  });

  it('creates a set in the dialog and goes to its page', async () => {
    const navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'New instance set' }))).click();
    const dialog = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    const name = await dialog.getHarness(MatInputHarness.with({ selector: '[formControlName=name]' }));
    await name.setValue('Tern Point yard');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Create set' }))).click();

    const req = backend.expectOne({ method: 'POST', url: '/api/instance-sets' });
    expect(req.request.body).toEqual({ name: 'Tern Point yard', description: '', visibility: 'private', source: '' });
    req.flush({ ...summary(9, 'Tern Point yard', 'private'), maps: [], scenarios: [], canManage: true });
    await fixture.whenStable();
    // The dialog's close runs after the awaited response, a few ticks later.
    for (let i = 0; i < 20 && navigate.mock.calls.length === 0; i++) await new Promise((r) => setTimeout(r, 10));
    expect(navigate).toHaveBeenCalledWith(['/instance-sets', 9]);
  });

  it('does not send a set without a name', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: 'New instance set' }))).click();
    const dialog = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Create set' }))).click();
    backend.expectNone({ method: 'POST', url: '/api/instance-sets' });
    expect(await (await dialog.host()).text()).toContain('Give the set a name.');
  });
});
