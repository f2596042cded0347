/** Top-level routes: every area is lazy so the first load carries only the shell. */
import { Routes } from '@angular/router';
import { roleGuard } from './core/role-guard';

/** The route table handed to `provideRouter`. */
export const routes: Routes = [
  { path: '', pathMatch: 'full', title: 'Quarterturn', loadComponent: () => import('./home/home') },
  { path: 'instance-sets', loadChildren: () => import('./instance-sets/instance-sets.routes') },
  { path: 'sweeps', loadChildren: () => import('./sweeps/sweeps.routes') },
  { path: 'leaderboards', loadChildren: () => import('./leaderboards/leaderboards.routes') },
  { path: 'reports', loadChildren: () => import('./reports/reports.routes') },
  { path: 'plans', loadChildren: () => import('./plan-viewer/plan-viewer.routes') },
  { path: 'help', title: 'Help · Quarterturn', loadComponent: () => import('./help/help-page') },
  { path: 'help/api', title: 'API reference · Quarterturn', loadComponent: () => import('./help/api-reference') },
  {
    path: 'account/tokens',
    title: 'API tokens · Quarterturn',
    canActivate: [roleGuard('researcher', 'API tokens')],
    loadComponent: () => import('./account/api-tokens-page'),
  },
  {
    path: 'admin',
    canActivate: [roleGuard('admin', 'Admin')],
    loadChildren: () => import('./admin/admin.routes'),
  },
  { path: 'not-allowed', title: 'Not allowed · Quarterturn', loadComponent: () => import('./core/not-allowed') },
  { path: '**', title: 'Not found · Quarterturn', loadComponent: () => import('./core/not-found') },
];
