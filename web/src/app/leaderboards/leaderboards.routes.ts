/** Routes of the Leaderboards area: the board, and the plan submission page. */
import type { Routes } from '@angular/router';

/** Leaderboards area routes. */
const routes: Routes = [
  { path: '', title: 'Leaderboards · Quarterturn', loadComponent: () => import('./leaderboard-board') },
  { path: 'submit', title: 'Submit a plan · Quarterturn', loadComponent: () => import('../submissions/submission-form') },
];
export default routes;
