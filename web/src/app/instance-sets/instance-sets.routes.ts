/** Routes of the Instance sets area. */
import type { Routes } from '@angular/router';

/** Instance sets area routes. */
const routes: Routes = [
  { path: '', title: 'Instance sets · Quarterturn', loadComponent: () => import('./instance-set-list') },
];
export default routes;
