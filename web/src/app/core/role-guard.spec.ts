import { Component } from '@angular/core';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { RouterTestingHarness } from '@angular/router/testing';
import type { Account, MeResponse } from '@shared/auth';
import { roleGuard } from './role-guard';
import NotAllowed from './not-allowed';

@Component({ selector: 'app-secret', template: '<h1>Account administration</h1>' })
class Secret {}

const BO: Account = {
  id: 3,
  login: 'bo-lattice',
  displayName: 'Bo Lattice',
  email: null,
  role: 'researcher',
  isEmailOn: false,
  createdAt: '2026-02-01T08:00:00.000Z',
};

describe('roleGuard', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter(
          [
            { path: 'admin', canActivate: [roleGuard('admin', 'Admin')], component: Secret },
            { path: 'not-allowed', component: NotAllowed },
          ],
          withComponentInputBinding(),
        ),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
  });

  afterEach(() => backend.verify());

  /** Starts navigating, answers the session request the guard waits for, and settles. */
  async function visitAdminAs(me: MeResponse): Promise<void> {
    const done = harness.navigateByUrl('/admin');
    // The router runs guards a few ticks later; the guard must then ask for the session.
    await new Promise((resolve) => setTimeout(resolve, 0));
    backend.expectOne('/api/me').flush(me);
    await done;
    await harness.fixture.whenStable();
  }

  it('refuses a researcher and explains which role the area needs', async () => {
    await visitAdminAs({ account: BO, role: 'researcher' });

    expect(TestBed.inject(Router).url).toBe('/not-allowed?area=Admin&needs=admin');
    expect(harness.routeNativeElement?.textContent).toContain('Not allowed');
    expect(harness.routeNativeElement?.textContent).toContain('Admin needs the admin role.');
    expect(harness.routeNativeElement?.textContent).toContain('role researcher');
    expect(harness.routeNativeElement?.textContent).not.toContain('Account administration');
  });

  it('refuses a visitor and offers sign-in', async () => {
    await visitAdminAs({ account: null, role: 'visitor' });

    expect(harness.routeNativeElement?.textContent).toContain('You are not signed in.');
    const loader = TestbedHarnessEnvironment.loader(harness.fixture);
    const signIn = await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }));
    expect(await (await signIn.host()).getAttribute('href')).toBe('/api/auth/github');
  });

  it('lets an admin in', async () => {
    await visitAdminAs({ account: { ...BO, role: 'admin' }, role: 'admin' });

    expect(TestBed.inject(Router).url).toBe('/admin');
    expect(harness.routeNativeElement?.textContent).toContain('Account administration');
  });
});
