import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import { SAFETY_NOTE } from '@shared/executions-constants';
import type { HistoryItem, InstanceHistory } from '@shared/history';
import InstanceHistoryPage, { HISTORY_PAGE } from './instance-history';
import { parametersText, sourceText } from './history-cells';

const PROFILE = { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0.1 };

/** One stored result; figures invented. */
function item(over: Partial<HistoryItem>): HistoryItem {
  return {
    resultId: 1, createdAt: '2026-11-02T09:00:00.000Z', status: 'solved', reason: null, isBest: false, hasPlan: true,
    source: { kind: 'sweep', sweepId: 4, sweepName: null, runId: 40, isSweepVisible: false },
    solver: { name: 'Quarterturn CBS', version: '0.1.0', commit: 'abc' }, environment: { node: 'v20', cpu: 'test cpu', threads: 1 },
    seed: 1, suboptimality: 1, parameters: { model: 'k-robust', k: 1, startHeading: 'free' },
    soc: 14, makespan: 6, lowerBound: 14, turnInclusiveSocMs: 17_400, turnInclusiveMakespanMs: 7_800, runtimeMs: 12.5, nodes: 3,
    isExecutableAtNominal: true, executions: [],
    ...over,
  };
}

const HISTORY: InstanceHistory = {
  instance: { instanceSetId: 3, instanceSetName: 'Gull Quay depot', mapId: 9, mapName: 'quay.map', scenarioId: 12, scenarioName: 'quay-1.scen', agents: 8 },
  model: 'k-robust', variant: 'k=1', profile: { hash: '3f9a0c1d2e4b5a69', label: 'forward 1000 ms, quarter turn 600 ms', parameters: PROFILE },
  costUnit: 'steps', total: 3, start: 0, limit: HISTORY_PAGE, safetyNote: SAFETY_NOTE,
  items: [
    item({ resultId: 30, createdAt: '2026-11-04T09:00:00.000Z', source: { kind: 'submission', submissionId: 2, uploader: 'wren' }, seed: null, lowerBound: null, solver: { name: 'hand planner', version: '2', commit: 'submitted' }, soc: 13, isBest: true }),
    item({
      resultId: 20, createdAt: '2026-11-03T09:00:00.000Z', source: { kind: 'sweep', sweepId: 5, sweepName: 'second pass', runId: 50, isSweepVisible: true }, seed: 7,
      executions: [{ policy: 'open-loop', runs: 20, successRate: 0.85, collisionsMean: 0.2, realisedMakespanMeanMs: 8100, realisedMakespanP95Ms: 8600, finishSpreadMeanMs: 420 }],
    }),
    item({ resultId: 10, status: 'timeout', reason: 'time limit 10 s', hasPlan: false, soc: null, makespan: null, turnInclusiveSocMs: null, turnInclusiveMakespanMs: null }),
  ],
};

describe('InstanceHistoryPage', () => {
  let fixture: ComponentFixture<InstanceHistoryPage>;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [InstanceHistoryPage], providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InstanceHistoryPage);
    for (const [name, value] of Object.entries({ scenarioId: '12', agents: '8', model: 'k-robust', variant: 'k=1', profile: '3f9a0c1d2e4b5a69' })) fixture.componentRef.setInput(name, value);
    // Not whenStable: the resource's pending request keeps the app unstable until the test answers it.
    fixture.detectChanges();
  });

  afterEach(() => backend.verify());

  const text = (): string => (fixture.nativeElement as HTMLElement).textContent ?? '';

  it('asks for the row named by its query parameters and lists every stored result with units in the headers', async () => {
    const req = backend.expectOne((r) => r.url === '/api/history');
    const sent = Object.fromEntries(req.request.params.keys().map((k) => [k, req.request.params.get(k)]));
    expect(sent).toEqual({ scenarioId: '12', agents: '8', model: 'k-robust', variant: 'k=1', profile: '3f9a0c1d2e4b5a69', start: '0', limit: String(HISTORY_PAGE) });
    req.flush(HISTORY);
    await fixture.whenStable();

    const table = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatTableHarness);
    const headers = await (await table.getHeaderRows())[0].getCellTextByIndex();
    expect(headers).toEqual(expect.arrayContaining(['Sum-of-costs (steps)', 'Lower bound (steps)', 'Turn-inclusive makespan (ms)', 'Solve time (ms)',
      'Execution success rate, open-loop', 'Realised makespan (mean), open-loop (ms)', 'Finish spread (mean), open-loop (ms)']));
    const rows = await table.getRows();
    expect(rows).toHaveLength(3);
    const sources = await Promise.all(rows.map(async (r) => (await r.getCells({ columnName: 'source' }))[0].getText()));
    expect(sources).toEqual(['submission 2 by wren', 'sweep 5 "second pass", run 50', 'sweep 4, run 40']);
    const statuses = await Promise.all(rows.map(async (r) => (await r.getCells({ columnName: 'status' }))[0].getText()));
    expect(statuses).toEqual(['solved', 'solved', 'timeout: time limit 10 s']);
    expect((await (await rows[1].getCells({ columnName: 'success-open-loop' }))[0].getText())).toBe('85% of 20');
    // Model, variant and profile are named above the table; the superseded rows stay listed.
    expect(text()).toContain('k-robust (k=1)');
    expect(text()).toContain('forward 1000 ms, quarter turn 600 ms');
    expect((fixture.nativeElement as HTMLElement).querySelectorAll('[data-testid="on-board"]')).toHaveLength(1);
    // Execution figures show, so the safety note goes with them.
    expect(text()).toContain(SAFETY_NOTE);
    // Only the sweep the viewer may open is a link.
    expect([...(fixture.nativeElement as HTMLElement).querySelectorAll('td[data-cell="source"] a')].map((a) => a.getAttribute('href'))).toEqual(['/sweeps/5']);
    expect(text()).toContain('1–3 of 3');
  });

  it('leaves the safety note out when no shown result was replayed, and pages to older results', async () => {
    backend.expectOne((r) => r.url === '/api/history').flush({ ...HISTORY, total: HISTORY_PAGE + 1, items: [HISTORY.items[0]] });
    await fixture.whenStable();
    expect(text()).not.toContain(SAFETY_NOTE);

    const older = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatButtonHarness.with({ text: 'Older' }));
    // The harness click waits for stability, which the next pending request would hold off.
    (await older.host()).click();
    fixture.detectChanges();
    const next = backend.expectOne((r) => r.url === '/api/history');
    expect(next.request.params.get('start')).toBe(String(HISTORY_PAGE));
    next.flush({ ...HISTORY, start: HISTORY_PAGE, total: HISTORY_PAGE + 1, items: [HISTORY.items[2]] });
    await fixture.whenStable();
    expect(text()).toContain(`${HISTORY_PAGE + 1}–${HISTORY_PAGE + 1} of ${HISTORY_PAGE + 1}`);
  });

  it('says so when the row is unknown or hidden (404)', async () => {
    backend.expectOne((r) => r.url === '/api/history').flush({ error: { code: 'NOT_FOUND', message: 'No stored results' } }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="history-missing"]')).not.toBeNull();
  });
});

describe('history cells', () => {
  it('writes model parameters without the model and w, switches by those turned off', () => {
    expect(parametersText({ model: 'classic', startHeading: 'N', switches: { bypass: false, wdg: true }, suboptimality: 1.5 })).toBe('start heading N, switches off: bypass');
    expect(parametersText({ model: 'classic' })).toBe('–');
  });

  it('names a source without a sweep or submission', () => {
    expect(sourceText({ kind: 'other' })).toBe('stored without a sweep or submission');
  });
});
