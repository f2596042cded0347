/** Routes of the Leaderboards area. */
import type { Routes } from '@angular/router';

/** Leaderboards area routes. */
const routes: Routes = [
  { path: '', title: 'Leaderboards · Quarterturn', loadComponent: () => import('./leaderboard-list') },
];
export default routes;
