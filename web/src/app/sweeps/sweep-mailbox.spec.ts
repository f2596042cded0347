import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import type { Account, MeResponse } from '@shared/auth';
import type { MailboxResponse } from '@shared/runs';
import NotAllowed from '../core/not-allowed';

const KIT: Account = {
  id: 4,
  login: 'kit-aisle',
  displayName: 'Kit Aisle',
  email: null,
  role: 'maintainer',
  isEmailOn: true,
  createdAt: '2026-03-01T09:00:00.000Z',
};

describe('the local mailbox page (/sweeps/mailbox)', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter(
          [
            { path: 'sweeps', loadChildren: () => import('./sweeps.routes') },
            { path: 'not-allowed', component: NotAllowed },
          ],
          withComponentInputBinding(),
        ),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
  });

  afterEach(() => backend.verify());

  /** Navigates to the mailbox, answering the session request a guard may make. */
  async function visitAs(me: MeResponse): Promise<void> {
    const done = harness.navigateByUrl('/sweeps/mailbox');
    await new Promise((resolve) => setTimeout(resolve, 0));
    for (const req of backend.match('/api/me')) req.flush(me);
    await done;
    await harness.fixture.whenStable();
  }

  it('turns a maintainer away without asking for the mail', async () => {
    await visitAs({ account: KIT, role: 'maintainer' });

    expect(TestBed.inject(Router).url).toBe('/not-allowed?area=Local%20mailbox&needs=admin');
    backend.expectNone('/api/dev/mailbox');
  });

  it("shows an admin the messages and says the page is for admins in development only", async () => {
    await visitAs({ account: { ...KIT, role: 'admin' }, role: 'admin' });
    const body: MailboxResponse = { messages: [{ id: 1, receivedAt: '2026-03-02T10:00:00.000Z', from: 'noreply@quarterturn.invalid', to: ['kit@example.test'], subject: 'Sweep "aisle" finished', text: 'Runs: 2' }] };
    backend.expectOne('/api/dev/mailbox').flush(body);
    await harness.fixture.whenStable();

    const text = harness.routeNativeElement?.textContent ?? '';
    expect(TestBed.inject(Router).url).toBe('/sweeps/mailbox');
    expect(text).toContain('Sweep "aisle" finished');
    expect(text).toMatch(/admins only/i);
    expect(text).toMatch(/development/i);
  });
});
