/** Routes of the Sweeps area. */
import type { Routes } from '@angular/router';
import { roleGuard } from '../core/role-guard';

/** Sweeps area routes: list, new (maintainers), external solvers, the dev mailbox (admins), one sweep. */
const routes: Routes = [
  { path: '', title: 'Sweeps · Quarterturn', canActivate: [roleGuard('researcher', 'Sweeps')], loadComponent: () => import('./sweep-list') },
  { path: 'new', title: 'New sweep · Quarterturn', canActivate: [roleGuard('maintainer', 'New sweep')], loadComponent: () => import('./sweep-editor') },
  // External solvers (issue 16, item 4): anyone signed in sees them, maintainers register and remove.
  { path: 'solvers', title: 'External solvers · Quarterturn', canActivate: [roleGuard('researcher', 'External solvers')], loadComponent: () => import('./external-solvers-page') },
  // Every person's sweep e-mail lands in the mailbox: admins only, as GET /api/dev/mailbox answers.
  { path: 'mailbox', title: 'Local mailbox · Quarterturn', canActivate: [roleGuard('admin', 'Local mailbox')], loadComponent: () => import('./sweep-mailbox') },
  { path: ':id', title: 'Sweep · Quarterturn', canActivate: [roleGuard('researcher', 'Sweeps')], loadComponent: () => import('./sweep-detail') },
];
export default routes;
