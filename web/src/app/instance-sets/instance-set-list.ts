/** Placeholder start page of the Instance sets area. */
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { AreaPlaceholder } from '../core/area-placeholder';

/** The page at /instance-sets until the area is built. */
@Component({
  selector: 'app-instance-set-list',
  template: `
    <app-area-placeholder heading="Instance sets">
      <p>
        Upload grid maps and their scenario files, group them into instance sets, and say where they come from and
        under which licence. Each map shows its size, free cells and a preview; each scenario lists its agents.
      </p>
    </app-area-placeholder>
  `,
  imports: [AreaPlaceholder],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class InstanceSetList {}
