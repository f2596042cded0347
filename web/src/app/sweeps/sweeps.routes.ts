/** Routes of the Sweeps area. */
import type { Routes } from '@angular/router';

/** Sweeps area routes. */
const routes: Routes = [
  { path: '', title: 'Sweeps · Quarterturn', loadComponent: () => import('./sweep-list') },
];
export default routes;
