import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { of } from 'rxjs';
import { InstanceSetApi } from '../instance-sets/instance-set-api';
import { SweepApi } from './sweep-api';
import SweepEditor from './sweep-editor';

describe('SweepEditor advice', () => {
  let fixture: ComponentFixture<SweepEditor>;
  const page = () => fixture.nativeElement as HTMLElement;
  const text = (testId: string) => page().querySelector(`[data-testid="${testId}"]`)?.textContent ?? '';
  const setNumber = async (control: string, value: number) => {
    const input = page().querySelector(`input[formcontrolname="${control}"]`) as HTMLInputElement;
    input.value = String(value);
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
  };

  beforeEach(async () => {
    const sets: Partial<InstanceSetApi> = { list: () => of({ items: [], total: 0, page: 1, pageSize: 100 }) as never, get: () => of(null) as never };
    TestBed.configureTestingModule({
      imports: [SweepEditor],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]),
        { provide: SweepApi, useValue: {} }, { provide: InstanceSetApi, useValue: sets }],
    });
    fixture = TestBed.createComponent(SweepEditor);
    await fixture.whenStable();
  });

  it('warns about following with its derivation once the diameter passes pitch/√2, and not before', async () => {
    // Defaults: 350 mm robots on a 500 mm pitch, classic and weighted-split, following allowed.
    expect(page().querySelector('[data-testid="following-hazard"]')).toBeNull();
    await setNumber('robotDiameterMm', 400);
    const hazard = text('following-hazard');
    expect(hazard).toContain('classic (following allowed)');
    expect(hazard).toContain('least distance is p/√2 = 353.6 mm');
    expect(hazard).toContain('Choose following forbidden, or k-robust plans with k ≥ 1');
  });

  it('clears the warning when following is forbidden', async () => {
    await setNumber('robotDiameterMm', 400);
    const forbid = [...page().querySelectorAll('mat-button-toggle')].find((t) => t.textContent?.includes('Following forbidden'));
    (forbid?.querySelector('button') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="following-hazard"]')).toBeNull();
  });

  it('says what the run count gives and what a chosen width needs, and can use that count', async () => {
    expect(text('run-precision')).toContain('With 20 Monte Carlo runs per plan and policy, an execution success rate is known to within ±20.1 %');
    expect(text('runs-needed')).toBe('±5 % on the execution success rate needs ≥ 381 Monte Carlo runs.');
    const use = [...page().querySelectorAll('button')].find((b) => b.textContent?.includes('Use 381 runs')) as HTMLButtonElement;
    use.click();
    await fixture.whenStable();
    expect((page().querySelector('input[formcontrolname="monteCarloRuns"]') as HTMLInputElement).value).toBe('381');
    expect(text('run-precision')).toContain('With 381 Monte Carlo runs per plan and policy, an execution success rate is known to within ±5 %');
  });

  it('offers the CBS switches by label with their explanation, shows the chosen labels, and sends the field names (issue 14, item 11)', async () => {
    const field = page().querySelector('[data-testid="cbs-switches"]') as HTMLElement;
    (field.querySelector('.mat-mdc-select-trigger') as HTMLElement).click();
    await fixture.whenStable();
    const options = [...document.querySelectorAll<HTMLElement>('mat-option[data-switch]')];
    expect(options.map((o) => o.querySelector('.switch-label')?.textContent?.trim())).toEqual([
      'Prioritised conflicts', 'Bypass', 'WDG heuristic', 'Disjoint splitting', 'Target reasoning', 'Corridor reasoning', 'Rectangle reasoning',
    ]);
    expect(options.every((o) => (o.querySelector('.switch-explanation')?.textContent?.trim().length ?? 0) > 30)).toBe(true);
    for (const o of options) expect(o.textContent).not.toMatch(/prioritizeConflicts|disjointSplitting|\bwdg\b|targetReasoning/);
    options.find((o) => o.dataset['switch'] === 'wdg')?.click();
    options.find((o) => o.dataset['switch'] === 'disjointSplitting')?.click();
    await fixture.whenStable();
    expect(field.querySelector('mat-select-trigger')?.textContent?.trim()).toBe('WDG heuristic, Disjoint splitting');
    const editor = fixture.componentInstance as unknown as { form: { getRawValue(): { switchesOff: string[] } } };
    expect(editor.form.getRawValue().switchesOff).toEqual(['wdg', 'disjointSplitting']);
  });

  it('states the wait rule beside the wait time', () => {
    expect(text('wait-rule')).toContain('unit-step models only');
    expect(text('wait-rule')).toContain('weighted-split plans wait any whole number of ms');
  });
});
