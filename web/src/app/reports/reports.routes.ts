/** Routes of the Reports area: the plan model comparison (set, profile and policy are query parameters). */
import type { Routes } from '@angular/router';

/** Reports area routes. */
const routes: Routes = [
  { path: '', title: 'Plan model comparison · Quarterturn', loadComponent: () => import('./model-comparison-page') },
];
export default routes;
