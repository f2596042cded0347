/**
 * The submission form against a fake backend: the instance picked from lists (set, map, scenario,
 * agents bounded by the scenario), the robot profile offered from the instance's results and sent
 * with the plan, the profile shown on the result, the styled file picker and a rejection's violation.
 * Requests the page starts are answered before any harness waits for stability (a pending request
 * holds stability off), so choices that start one are made on the element itself.
 */
import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { STARTER_PROFILE } from '@shared/executions-constants';
import type { InstanceSetDetail, InstanceSetListResponse } from '@shared/instance-sets';
import { profileLabel } from '@shared/leaderboards';
import type { SubmissionProfilesResponse, SubmissionView } from '@shared/submissions';
import { errorInterceptor } from '../core/error-interceptor';
import SubmissionForm from './submission-form';

/** The profile the instance's results use (invented figures). */
const USED = { ...STARTER_PROFILE, robotDiameterMm: 760 };
const PROFILES: SubmissionProfilesResponse = {
  items: [{ profile: USED, label: profileLabel(USED), results: 3 }, { profile: STARTER_PROFILE, label: profileLabel(STARTER_PROFILE), results: 0 }],
};
const owner = { id: 3, login: 'wren', displayName: 'Wren Okafor' };
const summary = { description: '', source: '', owner, createdAt: '2026-05-01T08:00:00.000Z', updatedAt: '2026-05-01T08:00:00.000Z' };
const SETS: InstanceSetListResponse = {
  items: [
    { ...summary, id: 5, name: 'Gull Quay depot', visibility: 'public', mapCount: 2, scenarioCount: 2 },
    { ...summary, id: 6, name: 'Empty drafts', visibility: 'private', mapCount: 0, scenarioCount: 0 },
  ],
  total: 2, page: 1, pageSize: 100,
};
const file = { checksum: 'a'.repeat(64), byteSize: 100 };
const SET: InstanceSetDetail = {
  ...SETS.items[0], canManage: false,
  maps: [{ ...file, id: 11, instanceSetId: 5, name: 'quay.map', width: 8, height: 8, passableCount: 60 }, { ...file, id: 12, instanceSetId: 5, name: 'yard.map', width: 9, height: 9, passableCount: 70 }],
  scenarios: [{ ...file, id: 21, instanceSetId: 5, mapId: 11, name: 'quay-1.scen', rowCount: 12, maxAgents: 10 }, { ...file, id: 22, instanceSetId: 5, mapId: 12, name: 'yard-1.scen', rowCount: 5, maxAgents: 5 }],
};
const VIEW: SubmissionView = {
  id: 1, resultId: 9, scenarioId: 21, scenarioName: 'quay-1.scen', mapName: 'quay.map', agents: 2, model: 'classic', variant: '',
  solver: { name: 'Hand planner', version: '1.0' }, soc: 2, makespan: 1, turnInclusiveSocMs: 2000, turnInclusiveMakespanMs: 1000,
  executions: [{ policy: 'open-loop', successRate: 1, finishSpreadMeanMs: 0 }], robotProfile: USED, profileLabel: profileLabel(USED),
  createdAt: '2026-01-02T00:00:00.000Z',
};

describe('SubmissionForm', () => {
  let fixture: ComponentFixture<SubmissionForm>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  const host = () => fixture.nativeElement as HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [SubmissionForm],
      providers: [
        provideRouter([]), provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SubmissionForm);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    // The list and set resources ask as soon as the page renders; stability waits for their answers.
    TestBed.tick();
    backend.expectOne('/api/submissions').flush({ items: [] });
    // The batch section below the form lists the researcher's batches (batch-upload.spec.ts covers it).
    backend.expectOne('/api/submissions/batches').flush({ items: [] });
    backend.expectOne('/api/instance-sets?page=1&pageSize=100').flush(SETS);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  /** Lets started requests and promise continuations run without waiting for stability. */
  async function turn(): Promise<void> {
    TestBed.tick();
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
  }

  /** Opens a select by harness and clicks the option starting with `text` on the element. */
  async function choose(control: string, text: string): Promise<void> {
    const select = await loader.getHarness(MatSelectHarness.with({ selector: `[formControlName="${control}"]` }));
    await select.open();
    const option = [...document.querySelectorAll<HTMLElement>('mat-option')].find((o) => o.textContent?.trim().startsWith(text));
    if (!option) throw new Error(`no option "${text}" in ${control}`);
    option.click();
    await turn();
  }

  /** Types into an input on the element (a harness would wait for the request the value starts). */
  async function type(control: string, value: string): Promise<void> {
    const input = host().querySelector<HTMLInputElement | HTMLTextAreaElement>(`[formControlName="${control}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    await turn();
  }

  /** Picks Gull Quay depot → quay.map → quay-1.scen and answers the profile request for `agents`. */
  async function pickInstance(): Promise<TestRequest> {
    await choose('setId', 'Gull Quay depot');
    backend.expectOne('/api/instance-sets/5').flush(SET);
    await turn();
    await choose('mapId', 'quay.map');
    await choose('scenarioId', 'quay-1.scen');
    return backend.expectOne('/api/submissions/profiles?scenarioId=21&agents=1');
  }

  async function sendText(): Promise<TestRequest> {
    await type('solverName', 'Hand planner');
    await type('solverVersion', '1.0');
    await type('text', '(0,0) (1,0)\n(2,2) (1,2)');
    host().querySelector<HTMLButtonElement>('button[type=submit]')!.click();
    await turn();
    return backend.expectOne({ method: 'POST', url: '/api/submissions' });
  }

  it('lists only the sets the API gives, with an empty set not selectable, and a set\'s maps and that map\'s scenarios', async () => {
    const select = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="setId"]' }));
    await select.open();
    const options = await select.getOptions();
    expect(await Promise.all(options.map((o) => o.getText()))).toEqual(['Gull Quay depot · public', 'Empty drafts · private · no scenarios']);
    expect(await options[1].isDisabled()).toBe(true);
    await select.close();
    (await pickInstance()).flush(PROFILES);
    await turn();
    const scenario = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="scenarioId"]' }));
    await scenario.open();
    // Only the scenarios of the chosen map.
    expect(await Promise.all((await scenario.getOptions()).map((o) => o.getText()))).toEqual(['quay-1.scen · up to 10 agents']);
    await scenario.close();
    expect(host().textContent).toContain('Scenario id 21, as a JSON plan document names it.');
  });

  it('bounds the agent count by the scenario', async () => {
    (await pickInstance()).flush(PROFILES);
    await type('agents', '12');
    await fixture.whenStable();
    const agents = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="agents"]' }));
    await agents.blur();
    // Past the scenario's largest usable k the field says the bound, and no profile is asked for.
    expect(host().querySelector('mat-error')?.textContent).toContain('From 1 to 10');
    await type('agents', '4');
    backend.expectOne('/api/submissions/profiles?scenarioId=21&agents=4').flush(PROFILES);
    await fixture.whenStable();
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Agents' }));
    expect(await field.getTextErrors()).toEqual([]);
    expect(await field.getTextHints()).toEqual(['1 to 10: the first rows of the scenario']);
  });

  it('offers the instance\'s most used profile first, sends the chosen profile and shows it on the result', async () => {
    (await pickInstance()).flush(PROFILES);
    await type('agents', '2');
    backend.expectOne('/api/submissions/profiles?scenarioId=21&agents=2').flush(PROFILES);
    await turn();
    const profile = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="profile"]' }));
    expect(await profile.getValueText()).toBe(`${profileLabel(USED)} · 3 results of this instance`);

    const req = await sendText();
    expect(req.request.body).toEqual({
      format: 'text', text: '(0,0) (1,0)\n(2,2) (1,2)', model: 'classic', startHeading: 'free', robotProfile: USED,
      instance: { scenarioId: 21, agents: 2 }, solver: { name: 'Hand planner', version: '1.0' },
    });
    req.flush(VIEW);
    await turn();
    backend.expectOne({ method: 'GET', url: '/api/submissions' }).flush({ items: [VIEW] });
    backend.expectOne('/api/submissions/profiles?scenarioId=21&agents=2').flush(PROFILES);
    await fixture.whenStable();
    const status = host().querySelector('[role="status"]');
    expect(status?.querySelector('[data-field=soc]')?.textContent).toBe('2');
    expect(status?.querySelector('[data-field=profile]')?.textContent).toBe(profileLabel(USED));
    expect(host().textContent).toContain('Your accepted plans');
  });

  it('sends another profile when the researcher chooses it', async () => {
    (await pickInstance()).flush(PROFILES);
    await turn();
    await choose('profile', profileLabel(STARTER_PROFILE));
    const req = await sendText();
    expect(req.request.body.robotProfile).toEqual(STARTER_PROFILE);
    req.flush(
      { error: { code: 'PLAN_REJECTED', message: 'The classic validator rejected the plan', details: { violation: { kind: 'swap', agents: [0, 1], time: 1, cell: [1, 0], message: 'swap' } } } },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await turn();
    await fixture.whenStable();
    const alert = host().querySelector('section[role="alert"]');
    expect(alert?.querySelector('[data-field=agents]')?.textContent).toBe('0, 1');
    expect(alert?.querySelector('[data-field=cell]')?.textContent).toBe('(1, 0)');
  });

  it('sends nothing before an instance is picked', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Check and submit' }))).click();
    // backend.verify() fails on any POST; the profile line asks for the instance.
    expect(host().querySelector('.profile .is-missing')?.textContent).toContain('Pick the scenario and agent count');
  });

  it('loads a JSON file through the styled picker, names it, and offers the profiles of the document\'s instance', async () => {
    const input = host().querySelector<HTMLInputElement>('input[type=file]')!;
    expect(input.classList).toContain('file-input');
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Choose a plan file…' }))).isDisabled()).toBe(false);
    const doc = JSON.stringify({ format: 'quarterturn-plan', version: 1, model: 'classic', instance: { scenarioId: 22, agents: 3 }, solver: { name: 'x', version: '1' }, paths: [] });
    Object.defineProperty(input, 'files', { value: [new File([doc], 'mine.json')], configurable: true });
    input.dispatchEvent(new Event('change'));
    await turn();
    await turn();
    backend.expectOne('/api/submissions/profiles?scenarioId=22&agents=3').flush(PROFILES);
    await turn();
    expect(host().querySelector('[data-field=file-name]')?.textContent).toBe(`mine.json, ${doc.length} B`);
    host().querySelector<HTMLButtonElement>('button[type=submit]')!.click();
    await turn();
    const req = backend.expectOne({ method: 'POST', url: '/api/submissions' });
    expect(req.request.body).toEqual({ format: 'json', text: doc, fileName: 'mine.json', robotProfile: USED });
    req.flush(VIEW);
    await turn();
    backend.expectOne('/api/submissions').flush({ items: [VIEW] });
    backend.expectOne('/api/submissions/profiles?scenarioId=22&agents=3').flush(PROFILES);
    await fixture.whenStable();
  });
});
