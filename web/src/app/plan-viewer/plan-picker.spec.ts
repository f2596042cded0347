import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatSelectHarness } from '@angular/material/select/testing';
import { of } from 'rxjs';
import type { PlanModel } from '@shared/plan';
import { InstanceSetApi } from '../instance-sets/instance-set-api';
import { PlanPicker } from './plan-picker';
import { TEST_PROFILE } from './plan-viewer-testing';
import type { PaneExecution } from './viewer-pane';

/** Only the fields the picker adopts from a shown plan (a solved instance of stored scenario 5). */
function shownPlan(id: number, model: PlanModel): PaneExecution {
  return {
    id, model, profile: TEST_PROFILE, modelOptions: { startHeading: 'free' },
    instance: { agents: [{}, {}, {}] }, source: { instanceSetId: 2, scenarioId: 5 },
  } as unknown as PaneExecution;
}

describe('PlanPicker', () => {
  async function setUp(scenarioName = 'quay-north-01') {
    const set = { id: 2, name: 'quay', scenarios: [{ id: 5, name: scenarioName, maxAgents: 8 }] };
    TestBed.configureTestingModule({
      imports: [PlanPicker],
      providers: [
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: InstanceSetApi, useValue: { list: () => of({ items: [set], total: 1 }), get: () => of(set) } },
      ],
    });
    const fixture = TestBed.createComponent(PlanPicker);
    await fixture.whenStable();
    const compare = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatSelectHarness.with({ selector: '[formControlName="compare"]' }));
    return { fixture, compare };
  }

  it('keeps the chosen "Compare with" model when the solved plan is shown (issue 14, item 10)', async () => {
    const { fixture, compare } = await setUp();
    await compare.open();
    await compare.clickOptions({ text: 'k-robust' });
    expect(await compare.getValueText()).toBe('k-robust');

    fixture.componentRef.setInput('shown', shownPlan(31, 'classic'));
    await fixture.whenStable();

    expect(await compare.getValueText()).toBe('k-robust');
  });

  it('clears "Compare with" only when it names the model now shown', async () => {
    const { fixture, compare } = await setUp();
    await compare.open();
    await compare.clickOptions({ text: 'k-robust' });

    fixture.componentRef.setInput('shown', shownPlan(32, 'k-robust'));
    await fixture.whenStable();

    expect(await compare.getValueText()).toBe('no second model');
  });

  it('cuts a long scenario name in the middle, keeping its end, with the full name as the option title (issue 14, item 10)', async () => {
    const long = 'warehouse-large-10-20-random-scenario-file-17';
    const { fixture } = await setUp(long);
    fixture.componentRef.setInput('shown', shownPlan(33, 'classic'));
    await fixture.whenStable();
    const scenario = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatSelectHarness.with({ selector: '[formControlName="scenarioId"]' }));
    await scenario.open();
    const options = await scenario.getOptions();
    expect(options).toHaveLength(1);

    expect(await options[0].getText()).toBe('warehouse-la…om-scenario-file-17 (up to 8 agents)'); // 31 kept: 12 of the start, 19 of the end
    expect(await (await options[0].host()).getAttribute('title')).toBe(long);
  });
});
