/** Fitting a profile in the field-trials panel: fitted values with intervals, the QQ plot, saving under a name. */
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import type { NamedRobotProfile, TrialCalibrationView } from '@shared/field-trials';
import { ProfileFit } from './profile-fit';

const CALIBRATION: TrialCalibrationView = {
  fit: {
    forwardMs: 1043.6, quarterTurnMs: 612.2, waitMs: null, timingJitter: 0.118, stallProbability: 0.04, stallMs: 1480,
    actions: { forward: 120, turn: 40, wait: 0 },
    ci95: { forwardMs: [1021, 1066], quarterTurnMs: [590, 634], waitMs: null, timingJitter: [0.104, 0.132], stallProbability: [0.02, 0.07], stallMs: [1400, 1560] },
    goodnessOfFit: { qq: [{ theoretical: -1.5, observed: -1.4 }, { theoretical: 0, observed: 0.1 }, { theoretical: 1.5, observed: 1.7 }], ksDistance: 0.041 },
  },
  profile: { forwardMs: 1044, quarterTurnMs: 612, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 760, timingJitter: 0.118 },
  provenance: { kind: 'trial-fit', resultId: 41, runs: [{ id: 7, fileName: 'a.csv' }, { id: 8, fileName: 'b.csv' }], stallProbability: 0.04, stallMs: 1480, fittedAt: '2026-12-04T03:00:00.000Z' },
};

describe('ProfileFit', () => {
  let fixture: ComponentFixture<ProfileFit>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProfileFit);
    fixture.componentRef.setInput('resultId', 41);
    fixture.componentRef.setInput('runCount', 2);
    fixture.detectChanges();
  });
  afterEach(() => backend.verify());

  it('shows the fitted values with their 95 % intervals and the QQ plot, and saves the fit of the same runs under a name', async () => {
    el().querySelector<HTMLButtonElement>('[data-testid="fit-profile"]')!.click();
    const fit = backend.expectOne({ method: 'POST', url: '/api/trials/results/41/calibration' });
    expect(fit.request.body).toEqual({});
    fit.flush(CALIBRATION);
    await fixture.whenStable();
    fixture.detectChanges();
    const rows = Array.from(el().querySelectorAll('[data-testid="fit-values"] tbody tr')).map((r) => Array.from(r.children).map((c) => c.textContent!.trim()));
    expect(rows[0]).toEqual(['Forward time (120 actions)', '1044 ms', '1021 ms – 1066 ms']);
    expect(rows[2]).toEqual(['Wait time (0 actions)', '–', 'not fitted']);
    expect(rows[3]).toEqual(['Timing jitter (CV)', '0.118', '0.104 – 0.132']);
    expect(el().querySelectorAll('circle.dot')).toHaveLength(3);
    expect(el().textContent).toContain('Kolmogorov–Smirnov distance 0.041');
    expect(el().textContent).toContain('stall probability 0.040 and stall length 1480 ms');

    const name = el().querySelector<HTMLInputElement>('[data-testid="profile-name"]')!;
    name.value = 'Floor B two-wheel';
    name.dispatchEvent(new Event('input'));
    fixture.detectChanges();
    el().querySelector<HTMLButtonElement>('[data-testid="save-profile"]')!.click();
    const save = backend.expectOne({ method: 'POST', url: '/api/robot-profiles' });
    expect(save.request.body).toEqual({ name: 'Floor B two-wheel', resultId: 41, runIds: [7, 8] });
    const saved: NamedRobotProfile = { id: 3, name: 'Floor B two-wheel', owner: 'marguerite-oyelaran', profile: CALIBRATION.profile, provenance: CALIBRATION.provenance, createdAt: '2026-12-04T03:00:00.000Z' };
    save.flush(saved);
    await fixture.whenStable();
    fixture.detectChanges();
    expect(el().querySelector('[data-testid="profile-saved"]')?.textContent).toContain('Saved as "Floor B two-wheel" (from 2 runs of result 41)');
  });
});
