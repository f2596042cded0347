import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { provideRouter } from '@angular/router';
import type { Account, Role } from '@shared/auth';
import { AccountMenu } from './account-menu';

const ADA: Account = {
  id: 7, login: 'ada-grid', displayName: 'Ada Gridley', email: 'ada@example.test',
  role: 'researcher', isEmailOn: true, createdAt: '2026-01-05T10:00:00.000Z',
};

/** Opens the menu for an account with the given role and returns the text of its head. */
async function menuTextAs(role: Role): Promise<string> {
  TestBed.configureTestingModule({
    imports: [AccountMenu],
    providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }],
  });
  const fixture = TestBed.createComponent(AccountMenu);
  fixture.componentRef.setInput('account', { ...ADA, role });
  fixture.componentRef.setInput('role', role);
  const menu = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatMenuHarness);
  await menu.open();
  return document.querySelector('.qt-account-menu .head')?.textContent ?? '';
}

describe('AccountMenu', () => {
  afterEach(() => document.querySelectorAll('.cdk-overlay-container').forEach((c) => c.remove()));

  it('tells a researcher that maintainers launch sweeps and an admin gives the role', async () => {
    const text = await menuTextAs('researcher');

    expect(text).toContain('Maintainers launch sweeps');
    expect(text).toContain('an admin gives the maintainer role');
  });

  it('tells a maintainer that their role launches sweeps', async () => {
    const text = await menuTextAs('maintainer');

    expect(text).toContain('Your role launches sweeps');
    expect(text).not.toContain('an admin gives');
  });
});
