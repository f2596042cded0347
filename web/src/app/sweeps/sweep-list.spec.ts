import { computed, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { of } from 'rxjs';
import type { Role } from '@shared/auth';
import { hasRole } from '@shared/auth-contract';
import { Session } from '../core/session';
import { SweepApi } from './sweep-api';
import SweepList from './sweep-list';

/** Renders an empty sweep list for a viewer with the given role and returns the page text. */
async function emptyListTextAs(role: Role): Promise<string> {
  const current = signal<Role>(role);
  const session: Partial<Session> = {
    role: current,
    isSignedIn: computed(() => current() !== 'visitor'),
    hasRole: (needed: Role) => hasRole(current(), needed),
  };
  TestBed.configureTestingModule({
    imports: [SweepList],
    providers: [
      provideRouter([]),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      { provide: SweepApi, useValue: { list: () => of({ items: [] }) } },
      { provide: Session, useValue: session },
    ],
  });
  const fixture = TestBed.createComponent(SweepList);
  await fixture.whenStable();
  return (fixture.nativeElement as HTMLElement).querySelector('.empty')?.textContent ?? '';
}

describe('SweepList, empty', () => {
  it('tells a researcher how to get a sweep run: ask a maintainer, or an admin for the role', async () => {
    const text = await emptyListTextAs('researcher');

    expect(text).toContain('No sweeps yet.');
    expect(text).toContain('ask one to run yours');
    expect(text).toContain('ask an admin for the maintainer role');
    expect(text).not.toContain('New sweep');
  });

  it('points a maintainer at New sweep instead', async () => {
    const text = await emptyListTextAs('maintainer');

    expect(text).toContain('New sweep');
    expect(text).not.toContain('ask an admin');
  });

  it('says only "No sweeps yet." to a visitor', async () => {
    expect((await emptyListTextAs('visitor')).trim()).toBe('No sweeps yet.');
  });
});
