/** Routes of the Sweeps area. */
import type { Routes } from '@angular/router';
import { roleGuard } from '../core/role-guard';

/** Sweeps area routes: list, new (maintainers), the dev mailbox, one sweep. */
const routes: Routes = [
  { path: '', title: 'Sweeps · Quarterturn', canActivate: [roleGuard('researcher', 'Sweeps')], loadComponent: () => import('./sweep-list') },
  { path: 'new', title: 'New sweep · Quarterturn', canActivate: [roleGuard('maintainer', 'New sweep')], loadComponent: () => import('./sweep-editor') },
  { path: 'mailbox', title: 'Local mailbox · Quarterturn', loadComponent: () => import('./sweep-mailbox') },
  { path: ':id', title: 'Sweep · Quarterturn', canActivate: [roleGuard('researcher', 'Sweeps')], loadComponent: () => import('./sweep-detail') },
];
export default routes;
