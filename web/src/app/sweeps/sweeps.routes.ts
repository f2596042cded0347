/** Routes of the Sweeps area. */
import type { Routes } from '@angular/router';
import { roleGuard } from '../core/role-guard';

/** Sweeps area routes: list, new (maintainers), the dev mailbox (admins), one sweep. */
const routes: Routes = [
  { path: '', title: 'Sweeps · Quarterturn', canActivate: [roleGuard('researcher', 'Sweeps')], loadComponent: () => import('./sweep-list') },
  { path: 'new', title: 'New sweep · Quarterturn', canActivate: [roleGuard('maintainer', 'New sweep')], loadComponent: () => import('./sweep-editor') },
  // Every person's sweep e-mail lands in the mailbox: admins only, as GET /api/dev/mailbox answers.
  { path: 'mailbox', title: 'Local mailbox · Quarterturn', canActivate: [roleGuard('admin', 'Local mailbox')], loadComponent: () => import('./sweep-mailbox') },
  { path: ':id', title: 'Sweep · Quarterturn', canActivate: [roleGuard('researcher', 'Sweeps')], loadComponent: () => import('./sweep-detail') },
];
export default routes;
