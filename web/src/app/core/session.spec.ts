import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { Account } from '@shared/auth';
import { DatabaseStatus } from './database-status';
import { Session } from './session';

const EVE: Account = {
  id: 9,
  login: 'eve-sipp',
  displayName: 'Eve Sipp',
  email: null,
  role: 'maintainer',
  isEmailOn: true,
  createdAt: '2026-04-01T12:00:00.000Z',
};

describe('Session', () => {
  let session: Session;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    session = TestBed.inject(Session);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('asks GET /api/me once however many callers wait for it', async () => {
    const first = session.load();
    const second = session.load();
    backend.expectOne('/api/me').flush({ account: EVE, role: 'maintainer' });

    await Promise.all([first, second]);
    expect([session.isLoaded(), session.role(), session.account()?.login]).toEqual([true, 'maintainer', 'eve-sipp']);
    expect([session.isAdmin(), session.hasRole('researcher'), session.hasRole('admin')]).toEqual([false, true, false]);
  });

  it('treats a failed GET /api/me as a visitor so the shell still works', async () => {
    const loading = session.load();
    backend.expectOne('/api/me').flush(null, { status: 500, statusText: 'Error' });

    await expect(loading).resolves.toEqual({ account: null, role: 'visitor' });
    expect([session.isLoaded(), session.isSignedIn(), session.role()]).toEqual([true, false, 'visitor']);
  });

  it('does not turn a signed-in person into a visitor while the database is down: waits and asks again', async () => {
    const loading = session.load();
    backend.expectOne('/api/me').flush(
      { error: { code: 'DATABASE_UNAVAILABLE', message: 'The database is not answering right now.' } },
      { status: 503, statusText: 'Service Unavailable', headers: { 'Retry-After': '5' } },
    );
    await new Promise((resolve) => setTimeout(resolve, 0));
    expect([session.isLoaded(), session.isSignedIn()]).toEqual([false, false]);
    expect(TestBed.inject(DatabaseStatus).isUnavailable()).toBe(true);

    TestBed.inject(DatabaseStatus).checkNow();
    backend.expectOne('/api/health').flush({ status: 'ok', db: 'up', version: '0.1.0' });
    await new Promise((resolve) => setTimeout(resolve, 0));
    backend.expectOne('/api/me').flush({ account: EVE, role: 'maintainer' });

    await expect(loading).resolves.toEqual({ account: EVE, role: 'maintainer' });
    expect([session.isLoaded(), session.isSignedIn(), session.role()]).toEqual([true, true, 'maintainer']);
  });

  it('asks again on reload', async () => {
    const loading = session.load();
    backend.expectOne('/api/me').flush({ account: null, role: 'visitor' });
    await loading;

    const reloading = session.reload();
    backend.expectOne('/api/me').flush({ account: { ...EVE, role: 'admin' }, role: 'admin' });
    await reloading;

    expect(session.isAdmin()).toBe(true);
  });
});
