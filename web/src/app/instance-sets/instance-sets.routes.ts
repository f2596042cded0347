/** Routes of the Instance sets area: the table, one set, and the map viewer. */
import type { Routes } from '@angular/router';

/** Instance sets area routes. */
const routes: Routes = [
  { path: '', title: 'Instance sets · Quarterturn', loadComponent: () => import('./instance-set-list') },
  { path: ':id', title: 'Instance set · Quarterturn', loadComponent: () => import('./instance-set-detail') },
  { path: ':id/maps/:mapId', title: 'Map · Quarterturn', loadComponent: () => import('../maps/map-viewer') },
];
export default routes;
