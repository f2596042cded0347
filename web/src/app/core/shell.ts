/**
 * The root component: a skip link to the main content, the top bar with product name, area
 * navigation and the account corner. When the path changes (a link, a launched sweep opening its
 * page) focus moves to the main content, so it never drops to the page body; a change of the
 * query alone (a board's view) leaves focus where it is.
 */
import { ChangeDetectionStrategy, Component, DestroyRef, inject } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatToolbarModule } from '@angular/material/toolbar';
import { NavigationEnd, Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { filter } from 'rxjs';
import { AccountMenu } from './account-menu';
import { DatabaseBanner } from './database-banner';
import { SIGN_IN_PATH } from '@shared/auth-contract';
import { Session } from './session';
import { focusById, SkipLink } from './skip-link';

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
  imports: [MatToolbarModule, MatButtonModule, RouterLink, RouterLinkActive, RouterOutlet, AccountMenu, DatabaseBanner, SkipLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class Shell {
  protected readonly session = inject(Session);
  protected readonly areas = AREAS;
  protected readonly signInUrl = SIGN_IN_PATH;

  constructor() {
    void this.session.load();
    let lastPath: string | null = null;
    inject(Router).events.pipe(filter((e) => e instanceof NavigationEnd), takeUntilDestroyed(inject(DestroyRef))).subscribe((e) => {
      const path = e.urlAfterRedirects.split(/[?#]/)[0];
      // The first page keeps the browser's own start (the skip link comes first).
      if (lastPath !== null && path !== lastPath) moveFocusToMain();
      lastPath = path;
    });
  }
}

/** Focus to <main>, unless something inside it holds focus already (a page that focused its own field). */
function moveFocusToMain(): void {
  const main = document.getElementById('main-content');
  if (main && main.contains(document.activeElement) && document.activeElement !== main) return;
  focusById('main-content', false);
}
