import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import { extractGuide } from '@shared/help';
import HelpPage from './help-page';

/** The guide exactly as the API serves it: the guide part of the repository's README.md. */
const GUIDE = extractGuide(readFileSync(join(__dirname, '..', '..', '..', '..', 'README.md'), 'utf8'));
/** Its `##` headings, in order. */
const HEADINGS = [...GUIDE.matchAll(/^## (.+)$/gm)].map((m) => m[1]);

describe('HelpPage', () => {
  let fixture: ComponentFixture<HelpPage>;
  let backend: HttpTestingController;
  const page = (): HTMLElement => fixture.nativeElement as HTMLElement;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [HelpPage],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(HelpPage);
  });

  afterEach(() => backend.verify());

  async function showGuide(markdown = GUIDE): Promise<void> {
    await fixture.whenStable();
    backend.expectOne({ method: 'GET', url: '/api/help/guide' }).flush(markdown);
    await fixture.whenStable();
  }

  it("renders README's guide with every section heading and a contents list of them", async () => {
    await showGuide();

    expect(HEADINGS).toEqual(expect.arrayContaining(['Signing in', 'Roles', 'Plan models', 'Execution policies', 'What the figures mean', 'File formats', 'Command-line tools']));
    const headings = [...page().querySelectorAll('article h2')].map((h) => h.textContent);
    expect(headings).toEqual(HEADINGS);
    const contents = [...page().querySelectorAll('nav[aria-label="On this page"] button')].map((b) => b.textContent);
    expect(contents).toEqual(HEADINGS);
    expect(page().querySelector('article table')).not.toBeNull();
    expect(page().querySelector('article')?.textContent).toContain('Simulation is no safety assessment');
  });

  it('links to both JSON Schemas at their stable URLs, above the guide and inside it', async () => {
    await showGuide();

    const top = [...page().querySelectorAll<HTMLAnchorElement>('nav[aria-label="JSON Schemas"] a')].map((a) => [a.textContent?.trim(), a.getAttribute('href')]);
    expect(top).toEqual([
      ['Plan format JSON Schema', '/api/schemas/plan-format.schema.json'],
      ['Instance format JSON Schema', '/api/schemas/instance-format.schema.json'],
    ]);
    const inGuide = [...page().querySelectorAll<HTMLAnchorElement>('article a')].map((a) => a.getAttribute('href'));
    expect(inGuide).toContain('/api/schemas/plan-format.schema.json');
    expect(inGuide).toContain('/api/schemas/instance-format.schema.json');
    // README's repository links that the app does not serve are shown as text, never as broken links.
    expect(inGuide.every((href) => href !== null && (href.startsWith('/') || /^https?:\/\//.test(href)))).toBe(true);
  });

  it('says it is loading, then that the guide is unavailable when the request fails', async () => {
    await fixture.whenStable();
    expect(page().textContent).toContain('Loading the guide…');

    backend.expectOne('/api/help/guide').flush(null, { status: 503, statusText: 'Unavailable' });
    await fixture.whenStable();

    expect(page().querySelector('[role="alert"]')?.textContent).toContain('The guide could not be loaded right now.');
  });

  it('scrolls to a section chosen in the contents list', async () => {
    await showGuide('## First\n\ntext\n\n## Second\n\nmore\n');
    const scrolled: string[] = [];
    // jsdom does no layout and has no scrollIntoView.
    HTMLElement.prototype.scrollIntoView = function (this: HTMLElement) {
      scrolled.push(this.textContent ?? '');
    };

    page().querySelectorAll<HTMLButtonElement>('nav[aria-label="On this page"] button')[1].click();

    expect(scrolled).toEqual(['Second']);
    expect(document.activeElement?.textContent).toBe('Second');
  });

  it('follows links to app pages with the router, without reloading the app', async () => {
    await showGuide('See [the boards](http://127.0.0.1:4300/leaderboards).');
    const router = TestBed.inject(Router);
    const navigate = jest.spyOn(router, 'navigateByUrl').mockResolvedValue(true);

    const link = page().querySelector<HTMLAnchorElement>('article a');
    expect(link?.getAttribute('href')).toBe('/leaderboards');
    link?.click();

    expect(navigate).toHaveBeenCalledWith('/leaderboards');
  });
});
