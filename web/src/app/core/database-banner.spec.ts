import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { firstValueFrom } from 'rxjs';
import type { HealthResponse } from '@shared/auth';
import type { ErrorBody } from '@shared/errors';
import { DatabaseBanner } from './database-banner';
import { errorInterceptor } from './error-interceptor';

const UNAVAILABLE: ErrorBody = { error: { code: 'DATABASE_UNAVAILABLE', message: 'The database is not answering right now.' } };

describe('DatabaseBanner', () => {
  let fixture: ComponentFixture<DatabaseBanner>;
  let http: HttpClient;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [DatabaseBanner],
      providers: [provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(DatabaseBanner);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const alertText = () => (fixture.nativeElement.querySelector('[role="alert"]') as HTMLElement | null)?.textContent ?? null;

  /** An API call the server answers 503 DATABASE_UNAVAILABLE. */
  async function failWithOutage(url: string): Promise<void> {
    const call = firstValueFrom(http.get(url));
    backend.expectOne(url).flush(UNAVAILABLE, { status: 503, statusText: 'Service Unavailable', headers: { 'Retry-After': '5' } });
    await expect(call).rejects.toMatchObject({ status: 503 });
    await fixture.whenStable();
  }

  it('shows nothing while the API answers', async () => {
    const call = firstValueFrom(http.get('/api/stats'));
    backend.expectOne('/api/stats').flush({ sweeps: 1 });
    await call;
    await fixture.whenStable();

    expect(alertText()).toBeNull();
  });

  it('says the database is down and the person is still signed in, instead of a snack bar', async () => {
    await failWithOutage('/api/sweeps');

    expect(alertText()).toMatch(/database is not answering/i);
    expect(alertText()).toMatch(/still signed in/i);
    const bars = await TestbedHarnessEnvironment.documentRootLoader(fixture).getAllHarnesses(MatSnackBarHarness);
    expect(bars).toHaveLength(0);
  });

  it('goes away once the health check finds the database up again', async () => {
    await failWithOutage('/api/me');
    const loader = TestbedHarnessEnvironment.loader(fixture);

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Check now' }))).click();
    const down: HealthResponse = { status: 'degraded', db: 'down', version: '0.1.0' };
    backend.expectOne('/api/health').flush(down);
    await fixture.whenStable();
    expect(alertText()).not.toBeNull();

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Check now' }))).click();
    const up: HealthResponse = { status: 'ok', db: 'up', version: '0.1.0' };
    backend.expectOne('/api/health').flush(up);
    await fixture.whenStable();
    expect(alertText()).toBeNull();
  });
});
