import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import type { HarnessLoader } from '@angular/cdk/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { MatSlideToggleHarness } from '@angular/material/slide-toggle/testing';
import { Component } from '@angular/core';
import { provideRouter, Router } from '@angular/router';
import type { Account, MeResponse } from '@shared/auth';
import { DatabaseStatus } from './database-status';
import Shell from './shell';

const ADA: Account = {
  id: 7,
  login: 'ada-grid',
  displayName: 'Ada Gridley',
  email: 'ada@example.test',
  role: 'researcher',
  isEmailOn: true,
  createdAt: '2026-01-05T10:00:00.000Z',
};

describe('Shell', () => {
  let fixture: ComponentFixture<Shell>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  async function renderAs(me: MeResponse): Promise<void> {
    TestBed.configureTestingModule({
      imports: [Shell],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Shell);
    loader = TestbedHarnessEnvironment.loader(fixture);
    backend.expectOne({ method: 'GET', url: '/api/me' }).flush(me);
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  async function navLabels(): Promise<string[]> {
    const links = await loader.getAllHarnesses(MatButtonHarness.with({ ancestor: 'nav' }));
    return Promise.all(links.map((l) => l.getText()));
  }

  it('shows the product name and the four public areas to a visitor, with a sign-in link', async () => {
    await renderAs({ account: null, role: 'visitor' });

    expect(fixture.nativeElement.textContent).toContain('Quarterturn');
    expect(await navLabels()).toEqual(['Instance sets', 'Sweeps', 'Leaderboards', 'Model comparison']);
    const signIn = await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }));
    expect(await (await signIn.host()).getAttribute('href')).toBe('/api/auth/github');
  });

  it('offers the Help page in the top bar to everyone, outside the area navigation', async () => {
    await renderAs({ account: null, role: 'visitor' });

    const help = await loader.getHarness(MatButtonHarness.with({ text: 'Help' }));
    expect(await (await help.host()).getAttribute('href')).toBe('/help');
    expect(await navLabels()).not.toContain('Help');
  });

  it('hides the Admin link from a researcher', async () => {
    await renderAs({ account: ADA, role: 'researcher' });

    expect(await navLabels()).not.toContain('Admin');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Sign in' }))).toHaveLength(0);
  });

  it('shows the Admin link to an admin', async () => {
    await renderAs({ account: { ...ADA, role: 'admin' }, role: 'admin' });

    expect(await navLabels()).toEqual(['Instance sets', 'Sweeps', 'Leaderboards', 'Model comparison', 'Admin']);
  });

  it('shows the display name and role in the account menu', async () => {
    await renderAs({ account: ADA, role: 'researcher' });

    const menu = await loader.getHarness(MatMenuHarness);
    expect(await menu.getTriggerText()).toBe('Ada Gridley researcher');
  });

  it('turns e-mail notifications off with PATCH /api/me/settings', async () => {
    await renderAs({ account: ADA, role: 'researcher' });
    const menu = await loader.getHarness(MatMenuHarness);
    await menu.open();
    const toggle = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatSlideToggleHarness);
    expect(await toggle.isChecked()).toBe(true);

    await toggle.toggle();

    const req = backend.expectOne({ method: 'PATCH', url: '/api/me/settings' });
    expect(req.request.body).toEqual({ isEmailOn: false });
    req.flush({ account: { ...ADA, isEmailOn: false }, role: 'researcher' });
    await fixture.whenStable();
    expect(await toggle.isChecked()).toBe(false);
  });

  it('puts the switch back when the server refuses the setting', async () => {
    await renderAs({ account: ADA, role: 'researcher' });
    const menu = await loader.getHarness(MatMenuHarness);
    await menu.open();
    const toggle = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatSlideToggleHarness);

    await toggle.toggle();
    backend
      .expectOne('/api/me/settings')
      .flush({ error: { code: 'FORBIDDEN', message: 'No.' } }, { status: 403, statusText: 'Forbidden' });
    await fixture.whenStable();

    expect(await toggle.isChecked()).toBe(true);
  });

  it('signs out with POST /api/auth/logout and then offers sign-in again', async () => {
    await renderAs({ account: { ...ADA, role: 'admin' }, role: 'admin' });
    const menu = await loader.getHarness(MatMenuHarness);

    await menu.clickItem({ text: 'Sign out' });
    backend.expectOne({ method: 'POST', url: '/api/auth/logout' }).flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();

    expect(await loader.getAllHarnesses(MatMenuHarness)).toHaveLength(0);
    expect(await navLabels()).not.toContain('Admin');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Sign in' }))).toHaveLength(1);
  });

  it('shows the database banner instead of a sign-in link while /api/me answers DATABASE_UNAVAILABLE, then the account', async () => {
    TestBed.configureTestingModule({ imports: [Shell], providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Shell);
    loader = TestbedHarnessEnvironment.loader(fixture);
    backend.expectOne('/api/me').flush(
      { error: { code: 'DATABASE_UNAVAILABLE', message: 'The database is not answering right now.' } },
      { status: 503, statusText: 'Service Unavailable', headers: { 'Retry-After': '5' } },
    );
    await fixture.whenStable();

    expect(fixture.nativeElement.querySelector('[role="alert"]')?.textContent).toMatch(/database is not answering[\s\S]*still signed in/i);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Sign in' }))).toHaveLength(0);

    TestBed.inject(DatabaseStatus).clear();
    await new Promise((resolve) => setTimeout(resolve, 0));
    backend.expectOne('/api/me').flush({ account: ADA, role: 'researcher' });
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[role="alert"]')).toBeNull();
    expect(await (await loader.getHarness(MatMenuHarness)).getTriggerText()).toBe('Ada Gridley researcher');
  });

  describe('keyboard', () => {
    @Component({ template: '<h1>A page</h1><button type="button">On the page</button>' })
    class Page {}

    beforeEach(async () => {
      TestBed.configureTestingModule({
        imports: [Shell],
        providers: [provideRouter([{ path: 'one', component: Page }, { path: 'two', component: Page }]), provideHttpClient(), provideHttpClientTesting()],
      });
      backend = TestBed.inject(HttpTestingController);
      fixture = TestBed.createComponent(Shell);
      // Focus needs the elements in the document.
      document.body.appendChild(fixture.nativeElement);
      backend.expectOne('/api/me').flush({ account: null, role: 'visitor' });
      await fixture.whenStable();
    });
    afterEach(() => (fixture.nativeElement as HTMLElement).remove());

    it('starts with a skip link that moves focus to the main content', () => {
      const first = (fixture.nativeElement as HTMLElement).querySelector('a');
      expect(first?.textContent?.trim()).toBe('Skip to main content');
      first?.click();
      expect(document.activeElement?.id).toBe('main-content');
      expect(document.activeElement?.tagName).toBe('MAIN');
    });

    it('moves focus to the main content when the path changes, and leaves it when only the query does', async () => {
      const router = TestBed.inject(Router);
      await router.navigateByUrl('/one');
      await fixture.whenStable();
      const button = (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>('main button')!;
      button.focus();

      await router.navigateByUrl('/one?layout=compare');
      await fixture.whenStable();
      expect(document.activeElement).toBe(button);

      // The old page's button goes with it: focus would drop to the body.
      await router.navigateByUrl('/two');
      await fixture.whenStable();
      expect(document.activeElement?.id).toBe('main-content');
    });
  });
});
