/** The sweep editor offers named robot profiles fitted from field runs as presets of the profile and stall fields (issue 17, item 4). */
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatSelectHarness } from '@angular/material/select/testing';
import { provideRouter } from '@angular/router';
import { of } from 'rxjs';
import type { NamedRobotProfile } from '@shared/field-trials';
import { InstanceSetApi } from '../instance-sets/instance-set-api';
import { SweepApi } from './sweep-api';
import SweepEditor from './sweep-editor';

const NAMED: NamedRobotProfile = {
  id: 3, name: 'Floor B two-wheel', owner: 'marguerite-oyelaran', createdAt: '2026-12-04T03:00:00.000Z',
  profile: { forwardMs: 1044, quarterTurnMs: 612, waitMs: 990, cellPitchMm: 1000, robotDiameterMm: 760, timingJitter: 0.118 },
  provenance: { kind: 'trial-fit', resultId: 41, runs: [{ id: 7, fileName: 'a.csv' }, { id: 8, fileName: 'b.csv' }], stallProbability: 0.04, stallMs: 1480, fittedAt: '2026-12-04T03:00:00.000Z' },
};

describe('SweepEditor named profiles', () => {
  let fixture: ComponentFixture<SweepEditor>;
  const value = (control: string) => (fixture.nativeElement.querySelector(`input[formcontrolname="${control}"]`) as HTMLInputElement).value;

  it('fills the profile fields and the stalls from the chosen named profile', async () => {
    const sets: Partial<InstanceSetApi> = { list: () => of({ items: [], total: 0, page: 1, pageSize: 100 }) as never, get: () => of(null) as never };
    TestBed.configureTestingModule({
      imports: [SweepEditor],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: SweepApi, useValue: {} }, { provide: InstanceSetApi, useValue: sets }],
    });
    fixture = TestBed.createComponent(SweepEditor);
    fixture.detectChanges();
    TestBed.inject(HttpTestingController).expectOne({ method: 'GET', url: '/api/robot-profiles' }).flush([NAMED]);
    await fixture.whenStable();
    const select = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatSelectHarness.with({ selector: '[data-testid="named-profile"]' }));
    await select.open();
    const options = await select.getOptions();
    expect(await options[0].getText()).toBe('Floor B two-wheel (marguerite-oyelaran, fitted from 2 field runs of result 41)');
    await options[0].click();
    await fixture.whenStable();
    expect([value('forwardMs'), value('quarterTurnMs'), value('waitMs'), value('cellPitchMm'), value('robotDiameterMm'), value('timingJitter')])
      .toEqual(['1044', '612', '990', '1000', '760', '0.118']);
    expect([value('stallProbability'), value('stallMs')]).toEqual(['0.04', '1480']);
  });
});
