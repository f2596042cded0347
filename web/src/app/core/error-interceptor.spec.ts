import { HttpClient, HttpContext, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { firstValueFrom } from 'rxjs';
import type { ErrorBody } from '@shared/errors';
import { IS_QUIET, errorInterceptor } from './error-interceptor';

@Component({ selector: 'app-host', template: '' })
class Host {}

describe('errorInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  /** Snack bars attach to the document's overlay container, so search from the document root. */
  function snackBars(): Promise<MatSnackBarHarness[]> {
    const fixture = TestBed.createComponent(Host);
    return TestbedHarnessEnvironment.documentRootLoader(fixture).getAllHarnesses(MatSnackBarHarness);
  }

  it("shows the server's message from the shared error shape and still fails the call", async () => {
    const call = firstValueFrom(http.patch('/api/admin/users/1', { role: 'researcher' }));
    const body: ErrorBody = { error: { code: 'LAST_ADMIN', message: 'At least one admin must remain.' } };
    backend.expectOne('/api/admin/users/1').flush(body, { status: 409, statusText: 'Conflict' });

    await expect(call).rejects.toMatchObject({ status: 409 });
    const [bar] = await snackBars();
    expect(await bar.getMessage()).toBe('At least one admin must remain.');
    expect(await bar.getActionDescription()).toBe('Dismiss');
  });

  it('falls back to a sentence naming the status when the body is not the shared shape', async () => {
    const call = firstValueFrom(http.get('/api/stats'));
    backend.expectOne('/api/stats').flush('<html>bad gateway</html>', { status: 502, statusText: 'Bad Gateway' });

    await expect(call).rejects.toMatchObject({ status: 502 });
    const [bar] = await snackBars();
    expect(await bar.getMessage()).toBe('The server failed (HTTP 502). Try again later.');
  });

  it('says the server could not be reached on a network failure', async () => {
    const call = firstValueFrom(http.get('/api/me'));
    backend.expectOne('/api/me').error(new ProgressEvent('error'));

    await expect(call).rejects.toMatchObject({ status: 0 });
    const [bar] = await snackBars();
    expect(await bar.getMessage()).toMatch(/could not be reached/);
  });

  it('stays silent for a request marked IS_QUIET', async () => {
    const call = firstValueFrom(http.get('/api/me', { context: new HttpContext().set(IS_QUIET, true) }));
    backend.expectOne('/api/me').flush({ error: { code: 'INTERNAL', message: 'x' } }, { status: 500, statusText: 'Error' });

    await expect(call).rejects.toMatchObject({ status: 500 });
    expect(await snackBars()).toHaveLength(0);
  });

  it('leaves successful responses alone', async () => {
    const call = firstValueFrom(http.get<{ n: number }>('/api/stats'));
    backend.expectOne('/api/stats').flush({ n: 3 });

    await expect(call).resolves.toEqual({ n: 3 });
    expect(await snackBars()).toHaveLength(0);
  });
});
