/** The root component: top bar with product name, area navigation and the account corner. */
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatToolbarModule } from '@angular/material/toolbar';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { AccountMenu } from './account-menu';
import { DatabaseBanner } from './database-banner';
import { SIGN_IN_PATH } from '@shared/auth-contract';
import { Session } from './session';

/** One entry of the area navigation. */
interface Area {
  readonly path: string;
  readonly label: string;
}

/** The areas every visitor sees; Admin is added for admins in the template. */
const AREAS: readonly Area[] = [
  { path: '/instance-sets', label: 'Instance sets' },
  { path: '/sweeps', label: 'Sweeps' },
  { path: '/leaderboards', label: 'Leaderboards' },
  { path: '/reports', label: 'Model comparison' },
];

/** App shell; `app-root` in index.html. */
@Component({
  selector: 'app-root',
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  imports: [MatToolbarModule, MatButtonModule, RouterLink, RouterLinkActive, RouterOutlet, AccountMenu, DatabaseBanner],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class Shell {
  protected readonly session = inject(Session);
  protected readonly areas = AREAS;
  protected readonly signInUrl = SIGN_IN_PATH;

  constructor() {
    void this.session.load();
  }
}
