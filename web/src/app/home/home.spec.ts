import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { ComponentHarness, type HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { provideRouter } from '@angular/router';
import type { StatsResponse } from '@shared/auth';
import Home from './home';

/** One counter tile of the home page (a test harness: the page has no Material widget for it). */
class CounterHarness extends ComponentHarness {
  static hostSelector = '[data-counter]';
  private readonly label = this.locatorFor('dt');
  private readonly value = this.locatorFor('dd');

  async read(): Promise<[string, string]> {
    return [await (await this.label()).text(), await (await this.value()).text()];
  }
}

describe('Home', () => {
  let fixture: ComponentFixture<Home>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [Home],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Home);
    loader = TestbedHarnessEnvironment.loader(fixture);
  });

  afterEach(() => backend.verify());

  async function counters(): Promise<[string, string][]> {
    return Promise.all((await loader.getAllHarnesses(CounterHarness)).map((c) => c.read()));
  }

  it('explains the product and shows the live counts from GET /api/stats', async () => {
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain('Counting…');

    const stats: StatsResponse = { instanceSets: 3, maps: 41, scenarios: 1250, sweeps: 0, results: 98765 };
    backend.expectOne({ method: 'GET', url: '/api/stats' }).flush(stats);
    await fixture.whenStable();

    expect(fixture.nativeElement.textContent).toContain('Conflict-Based Search');
    expect(await counters()).toEqual([
      ['Instance sets', '3'],
      ['Maps', '41'],
      ['Scenarios', '1,250'],
      ['Sweeps', '0'],
      ['Results', '98,765'],
    ]);
    // What the figures count (issue 14, item 10: "Results" used to say 0 whatever the hub held).
    expect(fixture.nativeElement.querySelector('[data-testid="counts-note"]')?.textContent).toContain('results are every stored outcome of a');
  });

  it('says the counts are unavailable when the request fails', async () => {
    backend.expectOne('/api/stats').flush(null, { status: 503, statusText: 'Unavailable' });
    await fixture.whenStable();

    expect(await counters()).toEqual([]);
    expect(fixture.nativeElement.textContent).toContain('The counts are unavailable right now.');
  });

  it('tells the visitor when the OAuth callback reported a failed sign-in', async () => {
    fixture.componentRef.setInput('signin', 'failed');
    backend.expectOne('/api/stats').flush({ instanceSets: 0, maps: 0, scenarios: 0, sweeps: 0, results: 0 });
    await fixture.whenStable();

    expect(fixture.nativeElement.textContent).toContain('Sign-in did not complete');
  });

  it('says nothing about sign-in on a normal visit', async () => {
    backend.expectOne('/api/stats').flush({ instanceSets: 0, maps: 0, scenarios: 0, sweeps: 0, results: 0 });
    await fixture.whenStable();

    expect(fixture.nativeElement.textContent).not.toContain('Sign-in did not complete');
  });

  it('states that simulation is no safety assessment', async () => {
    await fixture.whenStable();
    backend.expectOne('/api/stats').flush({ instanceSets: 0, maps: 0, scenarios: 0, sweeps: 0, results: 0 });

    expect(fixture.nativeElement.textContent).toMatch(/simulations, not a safety assessment/);
  });
});
