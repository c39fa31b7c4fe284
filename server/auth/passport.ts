import passportModule from 'passport';
import { Strategy as GitHubStrategy, type Profile } from 'passport-github2';
import type { Knex } from 'knex';
import type { Env } from '../env.js';
import { sessionUser, signInGithubUser } from '../services/users.js';

/** One passport instance per app, so tests can build several apps side by side. */
export function createPassport(env: Env, db: Knex) {
  const passport = new passportModule.Passport();
  passport.use(
    'github',
    new GitHubStrategy(
      {
        clientID: env.GITHUB_CLIENT_ID,
        clientSecret: env.GITHUB_CLIENT_SECRET,
        callbackURL: `${env.APP_ORIGIN}/auth/github/callback`,
        authorizationURL: env.GITHUB_AUTHORIZATION_URL,
        tokenURL: env.GITHUB_TOKEN_URL,
        userProfileURL: env.GITHUB_USER_PROFILE_URL,
        userEmailURL: env.GITHUB_USER_EMAIL_URL,
        scope: ['read:user', 'user:email'],
        state: true as unknown as string,
      },
      (_accessToken: string, _refreshToken: string, profile: Profile, done: (err: unknown, user?: Express.User | false) => void) => {
        signInGithubUser(
          db,
          {
            githubId: String(profile.id),
            login: profile.username ?? String(profile.id),
            name: profile.displayName || null,
            email: profile.emails?.[0]?.value ?? null,
            avatarUrl: profile.photos?.[0]?.value ?? null,
          },
          env.adminLogins,
        )
          .then((u) => done(null, { id: u.id, login: u.login, name: u.name, email: u.email, roles: [], via: 'session' }))
          .catch((err) => done(err));
      },
    ),
  );
  passport.serializeUser((user, done) => done(null, (user as Express.User).id));
  passport.deserializeUser((id: number, done) => {
    sessionUser(db, id)
      .then((u) => done(null, u ? { id: u.id, login: u.login, name: u.name, email: u.email, roles: u.roles, via: 'session' } : false))
      .catch((err) => done(err));
  });
  return passport;
}
