/** Placeholder start page of the Sweeps area. */
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { AreaPlaceholder } from '../core/area-placeholder';

/** The page at /sweeps until the area is built. */
@Component({
  selector: 'app-sweep-list',
  template: `
    <app-area-placeholder heading="Sweeps">
      <p>
        Define a sweep over instances, agent counts and plan models with a robot profile and time limit, launch it on
        the worker pool, and follow each run as it is solved, validated and replayed under an execution policy.
      </p>
    </app-area-placeholder>
  `,
  imports: [AreaPlaceholder],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SweepList {}
