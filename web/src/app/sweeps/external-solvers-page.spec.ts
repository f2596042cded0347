/** The external solvers page: the list with workers, the form's live check, registration and removal for maintainers only. */
import { computed, signal } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import { of } from 'rxjs';
import type { Role } from '@shared/auth';
import { hasRole } from '@shared/auth-contract';
import { EXAMPLE_SOLVER, type ExternalSolverView } from '@shared/external-solvers';
import { Session } from '../core/session';
import { ExternalSolverApi } from './external-solver-api';
import ExternalSolversPage, { registrationProblem } from './external-solvers-page';

const VIEW: ExternalSolverView = {
  id: 4, name: 'prioritised-astar', version: '1.0.0', models: ['classic'], command: EXAMPLE_SOLVER.command, commandSha256: 'c0ffee'.repeat(10) + 'c0de', planFormat: 'text',
  description: 'Prioritised planning.', registeredBy: { id: 2, login: 'tobiah-venkat' }, createdAt: '2026-12-01T10:00:00.000Z', workers: [],
};

describe('ExternalSolversPage', () => {
  let fixture: ComponentFixture<ExternalSolversPage>;
  let registered: unknown[];
  let removed: number[];

  async function render(role: Role): Promise<HTMLElement> {
    const current = signal<Role>(role);
    registered = [];
    removed = [];
    const api: Partial<ExternalSolverApi> = {
      list: () => of({ items: [VIEW] }),
      register: (body) => {
        registered.push(body);
        return of({ ...VIEW, id: 5, name: 'other', workers: ['host:7'] });
      },
      remove: (id) => {
        removed.push(id);
        return of(undefined);
      },
    };
    TestBed.configureTestingModule({
      imports: [ExternalSolversPage],
      providers: [
        provideRouter([]),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: ExternalSolverApi, useValue: api },
        { provide: Session, useValue: { role: current, isSignedIn: computed(() => current() !== 'visitor'), hasRole: (n: Role) => hasRole(current(), n) } },
        { provide: MatDialog, useValue: { open: () => ({ afterClosed: () => of(true) }) } },
      ],
    });
    fixture = TestBed.createComponent(ExternalSolversPage);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  it('lists a solver with its command and says when no worker has declared it', async () => {
    const page = await render('researcher');
    const item = page.querySelector('[data-solver="prioritised-astar@1.0.0"]');
    expect(item?.textContent).toContain(EXAMPLE_SOLVER.command);
    expect(page.querySelector('[data-testid="solver-workers"]')?.textContent).toContain('No worker has declared it lately');
    // The hash an operator pins in WORKER_SOLVERS to approve this command.
    expect(page.querySelector('[data-testid="command-hash"]')?.textContent?.trim()).toBe(`sha256:${VIEW.commandSha256}`);
    // Researchers read; only maintainers register and remove.
    expect(page.querySelector('form')).toBeNull();
    expect(page.querySelector('button')).toBeNull();
  });

  it('checks the form live with the shared rule, registers and removes for a maintainer', async () => {
    const page = await render('maintainer');
    const input = (name: string, value: string) => {
      const el = page.querySelector(`[formcontrolname="${name}"]`) as HTMLInputElement | HTMLTextAreaElement;
      el.value = value;
      el.dispatchEvent(new Event('input'));
    };
    // Nothing typed yet: no refusal is shown, but the empty form cannot be sent.
    expect(page.querySelector('[data-testid="solver-problem"]')?.textContent?.trim()).toBe('');
    expect((page.querySelector('button[type="submit"]') as HTMLButtonElement).disabled).toBe(true);
    input('name', 'other');
    input('version', '2');
    input('command', '/opt/other {map} {scenario} {agents}');
    await fixture.whenStable();
    expect(page.querySelector('[data-testid="solver-problem"]')?.textContent).toContain('the command must use {plan}');
    const submit = page.querySelector('button[type="submit"]') as HTMLButtonElement;
    expect(submit.disabled).toBe(true);
    input('command', '/opt/other {map} {scenario} {agents} {plan}');
    await fixture.whenStable();
    expect(submit.disabled).toBe(false);
    submit.click();
    await fixture.whenStable();
    expect(registered).toEqual([{ name: 'other', version: '2', models: ['classic'], planFormat: 'text', command: '/opt/other {map} {scenario} {agents} {plan}', description: '' }]);
    expect(page.querySelector('[data-solver="other@1.0.0"]')).not.toBeNull();

    (page.querySelector('[aria-label="Remove prioritised-astar 1.0.0"]') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(removed).toEqual([4]);
    expect(page.querySelector('[data-solver="prioritised-astar@1.0.0"]')).toBeNull();
  });

  it('names the field of the first problem', () => {
    expect(registrationProblem({ ...EXAMPLE_SOLVER })).toBeNull();
    expect(registrationProblem({ ...EXAMPLE_SOLVER, name: 'Bad Name' })).toContain('name: a solver name takes lower-case letters');
  });
});
