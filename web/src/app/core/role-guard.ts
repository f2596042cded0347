/** Keeps an area to accounts with a high enough role. */
import { inject } from '@angular/core';
import { Router, type CanActivateFn } from '@angular/router';
import type { Role } from '@shared/auth';
import { Session } from './session';

/**
 * A guard that waits for the session, lets `needed` (or higher) through and sends everyone
 * else to /not-allowed, which explains which role the area needs. `area` names the area there.
 */
export function roleGuard(needed: Exclude<Role, 'visitor'>, area: string): CanActivateFn {
  return async () => {
    const session = inject(Session);
    const router = inject(Router);
    await session.load();
    if (session.hasRole(needed)) return true;
    return router.createUrlTree(['/not-allowed'], { queryParams: { area, needs: needed } });
  };
}
