import { HttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { CSRF_COOKIE, CSRF_HEADER } from '@shared/auth';
import { appConfig } from './app-config';

describe('appConfig HTTP wiring', () => {
  let http: HttpClient;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [...appConfig.providers, provideHttpClientTesting()] });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    document.cookie = `${CSRF_COOKIE}=token-from-server; path=/`;
  });

  afterEach(() => {
    backend.verify();
    document.cookie = `${CSRF_COOKIE}=; expires=Thu, 01 Jan 1970 00:00:00 GMT; path=/`;
  });

  it('echoes the CSRF cookie in the CSRF header on a state-changing request', async () => {
    const call = firstValueFrom(http.patch('/api/me/settings', { isEmailOn: false }));
    const req = backend.expectOne('/api/me/settings');
    expect(req.request.headers.get(CSRF_HEADER)).toBe('token-from-server');
    req.flush({});
    await call;
  });

  it('sends no CSRF header on a read', async () => {
    const call = firstValueFrom(http.get('/api/me'));
    const req = backend.expectOne('/api/me');
    expect(req.request.headers.has(CSRF_HEADER)).toBe(false);
    req.flush({ account: null, role: 'visitor' });
    await call;
  });
});
