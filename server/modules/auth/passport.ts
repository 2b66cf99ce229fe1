import { Passport } from 'passport';
import { Strategy as GitHubStrategy, type Profile } from 'passport-github2';
import { publicUrl, type Config } from '../../config';
import type { User } from '../users/entity';
import type { ProviderProfile } from './service';

/** The callback path registered with the OAuth app. */
export const CALLBACK_PATH = '/auth/github/callback';

/** Provider endpoints: GitHub's in production, the local fake's (same paths) otherwise. */
export function providerUrls(config: Pick<Config, 'OAUTH_BASE_URL' | 'OAUTH_API_URL'>) {
  const base = config.OAUTH_BASE_URL.replace(/\/$/, '');
  const api = (config.OAUTH_API_URL ?? base).replace(/\/$/, '');
  return {
    authorizationURL: `${base}/login/oauth/authorize`,
    tokenURL: `${base}/login/oauth/access_token`,
    userProfileURL: `${api}/user`,
    userEmailURL: `${api}/user/emails`,
  };
}

/**
 * A passport instance of its own (not the global singleton, so several apps — tests — can live
 * in one process) with the GitHub strategy. `state: true` stores a random state in the session
 * and checks it on the callback, so a callback that this browser did not start is refused.
 */
export function createSignInPassport(config: Config, signIn: (profile: ProviderProfile) => Promise<User>): InstanceType<typeof Passport> {
  const passport = new Passport();
  passport.use(
    'github',
    new GitHubStrategy(
      {
        clientID: config.GITHUB_CLIENT_ID,
        clientSecret: config.GITHUB_CLIENT_SECRET,
        callbackURL: `${publicUrl(config)}${CALLBACK_PATH}`,
        scope: ['user:email'],
        allRawEmails: true,
        state: true as unknown as string,
        userAgent: 'pointfold',
        ...providerUrls(config),
      },
      (_accessToken: string, _refreshToken: string, profile: Profile, done: (err: unknown, user?: User | false) => void) => {
        const raw = (profile.emails ?? []) as { value: string; primary?: boolean; verified?: boolean }[];
        signIn({ providerId: String(profile.id), login: profile.username ?? String(profile.id), name: profile.displayName || null, emails: raw })
          .then((user) => done(null, user))
          .catch((err) => done(err));
      },
    ),
  );
  return passport;
}
