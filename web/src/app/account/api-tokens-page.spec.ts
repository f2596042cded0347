import { Clipboard } from '@angular/cdk/clipboard';
import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import type { Role } from '@shared/auth-contract';
import type { ApiTokenListResponse, ApiTokenView, CreatedApiToken } from '@shared/api-tokens-contract';
import { errorInterceptor } from '../core/error-interceptor';
import { Session } from '../core/session';
import ApiTokensPage from './api-tokens-page';

const token = (id: number, name: string, over: Partial<ApiTokenView> = {}): ApiTokenView => ({
  id, name, scopes: ['read'], createdAt: '2026-11-01T09:00:00.000Z', expiresAt: '2027-11-01T09:00:00.000Z', lastUsedAt: null, ...over,
});

const LIST: ApiTokenListResponse = {
  tokens: [
    token(2, 'nightly solver', { scopes: ['read', 'submit'], lastUsedAt: '2026-12-03T21:15:00.000Z' }),
    token(1, 'old laptop', { expiresAt: '2026-01-01T00:00:00.000Z' }),
  ],
};

const SECRET = 'qtk_' + 'A'.repeat(43);

describe('ApiTokensPage', () => {
  let fixture: ComponentFixture<ApiTokensPage>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let copied: string[];
  const page = (): HTMLElement => fixture.nativeElement as HTMLElement;

  async function open(role: Role = 'researcher'): Promise<void> {
    copied = [];
    TestBed.configureTestingModule({
      imports: [ApiTokensPage],
      providers: [
        provideRouter([]), provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting(),
        { provide: Session, useValue: { role: signal<Role>(role) } },
        { provide: Clipboard, useValue: { copy: (text: string) => copied.push(text) > 0 } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ApiTokensPage);
    loader = TestbedHarnessEnvironment.loader(fixture);
    backend.expectOne({ method: 'GET', url: '/api/me/tokens' }).flush(LIST);
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  it('lists each token with its scopes, dates, last use and whether it expired', async () => {
    await open();
    const table = await loader.getHarness(MatTableHarness);
    const rows = await table.getCellTextByColumnName();
    expect(rows['name'].text).toEqual(['nightly solver', 'old laptop']);
    expect(rows['scopes'].text).toEqual(['read, submit', 'read']);
    expect(rows['expiresAt'].text).toEqual(['2027-11-01', '2026-01-01 (expired)']);
    expect(rows['lastUsedAt'].text[1]).toBe('never');
    expect(rows['lastUsedAt'].text[0]).toMatch(/^2026-12-0[34] \d\d:\d\d$/);
  });

  it('creates a token with the chosen name, scopes and lifetime, and shows its secret once with a copy button', async () => {
    await open();
    await (await loader.getHarness(MatInputHarness.with({ placeholder: 'e.g. nightly solver run' }))).setValue('benchmark bot');
    await (await loader.getHarness(MatCheckboxHarness.with({ label: /^submit/ }))).check();
    await (await loader.getHarness(MatSelectHarness)).clickOptions({ text: '30 days' });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create token' }))).click();

    const req = backend.expectOne({ method: 'POST', url: '/api/me/tokens' });
    expect(req.request.body).toEqual({ name: 'benchmark bot', scopes: ['read', 'submit'], expiresInDays: 30 });
    const made: CreatedApiToken = { token: token(3, 'benchmark bot', { scopes: ['read', 'submit'] }), secret: SECRET };
    req.flush(made, { status: 201, statusText: 'Created' });
    // The component awaits the answer as a promise; let that continuation run before looking.
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();

    expect(page().querySelector('[data-testid="secret-value"]')?.textContent).toBe(SECRET);
    // The form is ready for the next token, without an error on the emptied name.
    expect(await (await loader.getHarness(MatInputHarness.with({ placeholder: 'e.g. nightly solver run' }))).getValue()).toBe('');
    expect(page().querySelector('mat-error')).toBeNull();
    expect(await (await loader.getHarness(MatCheckboxHarness.with({ label: /^read/ }))).isChecked()).toBe(true);
    expect(page().querySelector('[data-testid="new-secret"]')?.textContent).toContain('shown only this once');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Copy' }))).click();
    expect(copied).toEqual([SECRET]);
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Copied' }))).isDisabled()).toBe(false);
    const names = (await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName())['name'].text;
    expect(names[0]).toBe('benchmark bot');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Done' }))).click();
    expect(page().querySelector('[data-testid="new-secret"]')).toBeNull();
    expect(page().textContent).not.toContain(SECRET);
  });

  it('sends nothing without a scope and says why', async () => {
    await open();
    await (await loader.getHarness(MatInputHarness.with({ placeholder: 'e.g. nightly solver run' }))).setValue('no rights');
    await (await loader.getHarness(MatCheckboxHarness.with({ label: /^read/ }))).uncheck();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create token' }))).click();
    backend.expectNone({ method: 'POST', url: '/api/me/tokens' });
    expect(page().querySelector('.scope-error')?.textContent).toContain('at least one scope');
  });

  it('offers the sweep scope only to maintainers and admins', async () => {
    await open('researcher');
    expect(await (await loader.getHarness(MatCheckboxHarness.with({ label: /^sweep/ }))).isDisabled()).toBe(true);
    TestBed.resetTestingModule();
    await open('maintainer');
    expect(await (await loader.getHarness(MatCheckboxHarness.with({ label: /^sweep/ }))).isDisabled()).toBe(false);
  });

  it('revokes a token only after the confirmation', async () => {
    await open();
    await (await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Revoke old laptop"]' }))).click();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    let dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Revoke the token “old laptop”?');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Keep token' }))).click();
    await fixture.whenStable();
    backend.expectNone({ method: 'DELETE' });

    await (await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Revoke old laptop"]' }))).click();
    dialog = await root.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Revoke token' }))).click();
    backend.expectOne({ method: 'DELETE', url: '/api/me/tokens/1' }).flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    const names = (await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName())['name'].text;
    expect(names).toEqual(['nightly solver']);
  });
});
