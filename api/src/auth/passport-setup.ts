/** One Passport instance per app (not the global singleton), so parallel app instances in tests stay apart. */
import { Passport } from 'passport';
import type { AppConfig } from '../config';
import type { UsersService } from '../users/users.service';
import { toAccount } from '../users/account';
import { createGitHubStrategy } from './github-strategy';
import './session-user';

/** A Passport with the github strategy that keeps only the user id in the session. */
export function createPassport(config: AppConfig, users: UsersService, fakeOAuthUrl: string): InstanceType<typeof Passport> {
  const passport = new Passport();
  passport.use('github', createGitHubStrategy(config, users, fakeOAuthUrl));
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: unknown, done) => {
    if (typeof id !== 'number') return done(null, false);
    // Loaded on every request so role changes and deletions apply at once.
    users.findById(id).then((u) => done(null, u ? toAccount(u) : false), done);
  });
  return passport;
}
