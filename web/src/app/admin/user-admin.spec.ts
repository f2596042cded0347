import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Account, UserListResponse } from '@shared/auth';
import type { StorageQuotaView } from '@shared/storage-quota';
import { errorInterceptor } from '../core/error-interceptor';
import UserAdmin from './user-admin';

const account = (id: number, login: string, displayName: string, role: Account['role']): Account => ({
  id,
  login,
  displayName,
  email: `${login}@example.test`,
  role,
  isEmailOn: true,
  createdAt: '2026-03-0' + id + 'T09:00:00.000Z',
});

const USERS: UserListResponse = {
  users: [account(1, 'cyra-admin', 'Cyra Node', 'admin'), account(2, 'dev-pathson', 'Dev Pathson', 'researcher')],
};

const QUOTA: StorageQuotaView = {
  userId: 2,
  limits: { files: 40, cells: 16_777_216, bytes: 268_435_456 },
  used: { files: 12, cells: 4096, bytes: 51_200 },
  isDefault: { files: false, cells: true, bytes: true },
};

describe('UserAdmin', () => {
  let fixture: ComponentFixture<UserAdmin>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [UserAdmin],
      providers: [provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting(),
        // Without animations a dialog closes at once, so afterClosed() fires within the test.
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(UserAdmin);
    loader = TestbedHarnessEnvironment.loader(fixture);
    backend.expectOne({ method: 'GET', url: '/api/admin/users' }).flush(USERS);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function roleSelect(login: string): Promise<MatSelectHarness> {
    return loader.getHarness(MatSelectHarness.with({ selector: `[aria-label="Role of ${login}"]` }));
  }

  it('lists every account with its role', async () => {
    const table = await loader.getHarness(MatTableHarness);
    const rows = await table.getCellTextByColumnName();

    expect(rows['login'].text).toEqual(['cyra-admin', 'dev-pathson']);
    expect(rows['displayName'].text).toEqual(['Cyra Node', 'Dev Pathson']);
    expect(rows['createdAt'].text).toEqual(['2026-03-01', '2026-03-02']);
    expect(await (await roleSelect('cyra-admin')).getValueText()).toBe('admin');
    expect(await (await roleSelect('dev-pathson')).getValueText()).toBe('researcher');
  });

  /** Picks `role` in the picker of `login` (pending only) and presses its Save button. */
  async function pickAndSave(login: string, role: string): Promise<MatSelectHarness> {
    const select = await roleSelect(login);
    await select.open();
    await select.clickOptions({ text: role });
    await (await loader.getHarness(MatButtonHarness.with({ selector: `[aria-label="Save role of ${login}"]` }))).click();
    return select;
  }

  /** The open confirmation dialog, its text, and a click on one of its buttons. */
  async function confirmation(): Promise<{ title: string; text: string; click: (label: string) => Promise<void> }> {
    const dialog = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    return {
      title: await dialog.getTitleText(),
      text: await dialog.getContentText(),
      click: async (label) => {
        await (await dialog.getHarness(MatButtonHarness.with({ text: label }))).click();
        await fixture.whenStable();
      },
    };
  }

  it('keeps a picked role pending, with no question and nothing sent, until Save', async () => {
    const select = await roleSelect('dev-pathson');
    const save = await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Save role of dev-pathson"]' }));
    expect(await save.isDisabled()).toBe(true);

    // ArrowDown on the closed picker (what once saved at once) only moves the pending choice.
    const host = (fixture.nativeElement as HTMLElement).querySelector<HTMLElement>('[aria-label="Role of dev-pathson"]')!;
    host.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowDown', keyCode: 40, bubbles: true }));
    await fixture.whenStable();

    expect(await select.getValueText()).toBe('maintainer');
    expect(await select.isOpen()).toBe(false);
    expect(await TestbedHarnessEnvironment.documentRootLoader(fixture).getAllHarnesses(MatDialogHarness)).toHaveLength(0);
    backend.expectNone('/api/admin/users/2');
    expect(await save.isDisabled()).toBe(false);
    expect(fixture.nativeElement.textContent).toContain('unsaved: researcher → maintainer');

    // Picking the saved role again leaves nothing pending.
    await select.open();
    await select.clickOptions({ text: 'researcher' });
    expect(await save.isDisabled()).toBe(true);
  });

  it('asks before a role change and, when kept, sends nothing and shows the old role', async () => {
    const select = await pickAndSave('dev-pathson', 'maintainer');

    const ask = await confirmation();
    expect(ask.title).toBe('Make Dev Pathson (dev-pathson) a maintainer?');
    expect(ask.text).toContain('From researcher to maintainer: a maintainer also launches sweeps');
    expect(ask.text).toContain('It takes effect at their next request');
    await ask.click('Keep researcher');

    backend.expectNone('/api/admin/users/2');
    expect(await TestbedHarnessEnvironment.documentRootLoader(fixture).getAllHarnesses(MatDialogHarness)).toHaveLength(0);
    expect(await select.getValueText()).toBe('researcher');
  });

  it('says what a demotion takes away', async () => {
    await pickAndSave('cyra-admin', 'researcher');

    const ask = await confirmation();
    expect(ask.title).toBe('Make Cyra Node (cyra-admin) a researcher?');
    expect(ask.text).toContain('Rights they lose (what an admin may and a researcher may not): launches sweeps, curates shared sets and leaderboards; manages accounts.');
    expect(ask.text).toContain("Sweeps over other people's private sets go out of their sight");
    await ask.click('Keep admin');
    backend.expectNone('/api/admin/users/1');
  });

  it('sends PATCH /api/admin/users/:id with the chosen role once confirmed, and says it was saved', async () => {
    const select = await pickAndSave('dev-pathson', 'maintainer');
    await (await confirmation()).click('Make maintainer');

    const req = backend.expectOne({ method: 'PATCH', url: '/api/admin/users/2' });
    expect(req.request.body).toEqual({ role: 'maintainer' });
    expect(await select.isDisabled()).toBe(true);
    req.flush({ ...USERS.users[1], role: 'maintainer' });
    await fixture.whenStable();

    expect(await select.getValueText()).toBe('maintainer');
    expect(await select.isDisabled()).toBe(false);
    const bar = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatSnackBarHarness);
    expect(await bar.getMessage()).toBe('Saved: Dev Pathson (dev-pathson) is now a maintainer.');
    // A polite live region: the saved message waits for the screen reader to finish.
    expect(await bar.getAriaLive()).toBe('polite');
    expect(fixture.nativeElement.textContent).not.toContain('unsaved:');
  });

  it("shows the server's LAST_ADMIN message and puts the old role back", async () => {
    const select = await pickAndSave('cyra-admin', 'researcher');
    await (await confirmation()).click('Make researcher');

    backend.expectOne('/api/admin/users/1').flush(
      { error: { code: 'LAST_ADMIN', message: 'Cyra Node is the last admin and cannot be demoted.' } },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();

    const bar = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatSnackBarHarness);
    expect(await bar.getMessage()).toBe('Cyra Node is the last admin and cannot be demoted.');
    expect(await select.getValueText()).toBe('admin');
  });

  describe('storage quota', () => {
    // A plain click: a harness click waits for stability, which includes the quota request it starts.
    function openQuota(login: string): void {
      (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>(`[aria-label="Storage quota of ${login}"]`)?.click();
      fixture.detectChanges();
    }
    const field = (label: string, login: string) => loader.getHarness(MatInputHarness.with({ selector: `[aria-label="${label} limit of ${login}"]` }));

    it("shows a person's use and own limits, with default limits as empty fields", async () => {
      openQuota('dev-pathson');
      backend.expectOne({ method: 'GET', url: '/api/admin/users/2/quota' }).flush(QUOTA);
      await fixture.whenStable();

      expect(await (await field('Files', 'dev-pathson')).getValue()).toBe('40');
      expect(await (await field('Map cells', 'dev-pathson')).getValue()).toBe('');
      expect(fixture.nativeElement.textContent).toContain('uses 4,096 of 16,777,216 (default)');
    });

    it('sends every kind, an emptied field as null (back to the default)', async () => {
      openQuota('dev-pathson');
      backend.expectOne('/api/admin/users/2/quota').flush(QUOTA);
      await fixture.whenStable();
      await (await field('Files', 'dev-pathson')).setValue('');
      await (await field('Bytes', 'dev-pathson')).setValue('1000000');
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Save quota' }))).click();

      const req = backend.expectOne({ method: 'PATCH', url: '/api/admin/users/2/quota' });
      expect(req.request.body).toEqual({ files: null, cells: null, bytes: 1_000_000 });
      req.flush({ ...QUOTA, limits: { ...QUOTA.limits, files: 5000, bytes: 1_000_000 }, isDefault: { files: true, cells: true, bytes: false } });
      await fixture.whenStable();
      expect(await (await field('Bytes', 'dev-pathson')).getValue()).toBe('1000000');
    });

    it('does not send a limit that is not a whole number', async () => {
      openQuota('dev-pathson');
      backend.expectOne('/api/admin/users/2/quota').flush(QUOTA);
      await fixture.whenStable();
      await (await field('Files', 'dev-pathson')).setValue('12.5');

      expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Save quota' }))).isDisabled()).toBe(true);
    });
  });
});
