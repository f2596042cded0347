/**
 * The passport-github2 strategy, pointed either at github.com (unchanged defaults) or at the
 * local fake provider. Fake identities are stored with provider 'fake' so they can never
 * collide with a real GitHub account of the same numeric id.
 */
import { Strategy as GitHubStrategy, type Profile } from 'passport-github2';
import type { AppConfig } from '../config';
import { FAKE_OAUTH_CLIENT } from '../config';
import { FAKE_OAUTH_PATHS } from '../dev/fake-oauth/fake-oauth-provider';
import type { ProviderIdentity, UsersService } from '../users/users.service';
import { toAccount } from '../users/account';

/** Path of the OAuth callback under the public URL. */
export const CALLBACK_PATH = '/api/auth/github/callback';

/** The redirect URI registered with the provider for this app. */
export function callbackUrl(config: AppConfig): string {
  return config.publicUrl + CALLBACK_PATH;
}

/** The provider identity in a passport-github2 profile. */
export function identityFromProfile(provider: string, profile: Profile): ProviderIdentity {
  const login = profile.username;
  if (!login) throw new Error('The OAuth provider returned a profile without a login');
  return {
    provider,
    providerId: String(profile.id),
    login,
    // GitHub's `name` is optional; fall back to the login so the UI always has a name.
    displayName: profile.displayName || login,
    email: profile.emails?.[0]?.value ?? null,
  };
}

/** Builds the strategy; `fakeOAuthUrl` is the fake provider's base URL in fake mode. */
export function createGitHubStrategy(config: AppConfig, users: UsersService, fakeOAuthUrl: string): GitHubStrategy {
  const credentials = config.oauth.mode === 'github'
    ? { clientID: config.oauth.clientId, clientSecret: config.oauth.clientSecret }
    : {
        clientID: FAKE_OAUTH_CLIENT.clientId,
        clientSecret: FAKE_OAUTH_CLIENT.clientSecret,
        authorizationURL: fakeOAuthUrl + FAKE_OAUTH_PATHS.authorize,
        tokenURL: fakeOAuthUrl + FAKE_OAUTH_PATHS.token,
        userProfileURL: fakeOAuthUrl + FAKE_OAUTH_PATHS.user,
        userEmailURL: fakeOAuthUrl + FAKE_OAUTH_PATHS.emails,
      };
  const provider = config.oauth.mode;
  return new GitHubStrategy(
    {
      ...credentials,
      callbackURL: callbackUrl(config),
      // user:email lets the strategy read a private primary address; read:user is the minimum for the profile.
      scope: ['read:user', 'user:email'],
      // `true` makes passport-oauth2 store a random `state` in the session and check it on
      // return (RFC 6749 §10.12); the passport-github2 typings wrongly declare a string.
      state: true as unknown as string,
      userAgent: 'quarterturn',
    },
    (_accessToken: string, _refreshToken: string, profile: Profile, done: (err: unknown, user?: Express.User | false) => void) => {
      users.signIn(identityFromProfile(provider, profile)).then(
        (user) => done(null, toAccount(user)),
        (err: unknown) => done(err),
      );
    },
  );
}
