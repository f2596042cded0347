import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Account, UserListResponse } from '@shared/auth';
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

describe('UserAdmin', () => {
  let fixture: ComponentFixture<UserAdmin>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [UserAdmin],
      providers: [provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting()],
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

  it('sends PATCH /api/admin/users/:id with the chosen role', async () => {
    const select = await roleSelect('dev-pathson');
    await select.open();
    await select.clickOptions({ text: 'maintainer' });

    const req = backend.expectOne({ method: 'PATCH', url: '/api/admin/users/2' });
    expect(req.request.body).toEqual({ role: 'maintainer' });
    expect(await select.isDisabled()).toBe(true);
    req.flush({ ...USERS.users[1], role: 'maintainer' });
    await fixture.whenStable();

    expect(await select.getValueText()).toBe('maintainer');
    expect(await select.isDisabled()).toBe(false);
  });

  it("shows the server's LAST_ADMIN message and puts the old role back", async () => {
    const select = await roleSelect('cyra-admin');
    await select.open();
    await select.clickOptions({ text: 'researcher' });

    backend.expectOne('/api/admin/users/1').flush(
      { error: { code: 'LAST_ADMIN', message: 'Cyra Node is the last admin and cannot be demoted.' } },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();

    const bar = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatSnackBarHarness);
    expect(await bar.getMessage()).toBe('Cyra Node is the last admin and cannot be demoted.');
    expect(await select.getValueText()).toBe('admin');
  });
});
