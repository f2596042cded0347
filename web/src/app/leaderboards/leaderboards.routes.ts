/** Routes of the Leaderboards area: the board, the plan submission page and a row's history. */
import type { Routes } from '@angular/router';

/** Leaderboards area routes. */
const routes: Routes = [
  { path: '', title: 'Leaderboards · Quarterturn', loadComponent: () => import('./leaderboard-board') },
  { path: 'submit', title: 'Submit a plan · Quarterturn', loadComponent: () => import('../submissions/submission-form') },
  { path: 'history', title: 'Row history · Quarterturn', loadComponent: () => import('../history/instance-history') },
];
export default routes;
