/** Placeholder start page of the Leaderboards area. */
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { AreaPlaceholder } from '../core/area-placeholder';

/** The page at /leaderboards until the area is built. */
@Component({
  selector: 'app-leaderboard-list',
  template: `
    <app-area-placeholder heading="Leaderboards">
      <p>
        Compare plan models instance by instance: success rate, sum-of-costs, makespan, turn-inclusive makespan, lower
        bound and solve time, plus collisions, realised makespan and finish spread from the simulated fleet.
      </p>
      <p>
        Simulated execution is no safety assessment: robots that work near people must meet the safety standards and
        local rules that apply to them.
      </p>
    </app-area-placeholder>
  `,
  imports: [AreaPlaceholder],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class LeaderboardList {}
