/** Routes of the plan viewer area: /plans/view?scenario=…&agents=…&model=…[&compare=…] or ?execution=ID[,ID]. */
import type { Routes } from '@angular/router';

/** Plan viewer routes. */
const routes: Routes = [
  { path: '', pathMatch: 'full', redirectTo: 'view' },
  { path: 'view', title: 'Plan viewer · Quarterturn', loadComponent: () => import('./plan-viewer') },
];
export default routes;
