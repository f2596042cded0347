/** Routes of the admin area (the role guard sits on the parent route in app-routes.ts). */
import type { Routes } from '@angular/router';

/** Admin area routes. */
const routes: Routes = [
  { path: '', title: 'Admin · Quarterturn', loadComponent: () => import('./user-admin') },
];
export default routes;
