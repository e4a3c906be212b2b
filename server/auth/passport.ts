/** passport-local: e-mail and password, checked against the bcrypt hash; the session keeps the user id. */
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { Organization, User } from '../db/models';
import { HttpError } from '../http/errors';
import { passwordMatches } from './passwords';
import './types';

export const INVALID_CREDENTIALS = 'That e-mail and password do not match an account.';

/** Finds the account for a sign-in; one message for an unknown e-mail and a wrong password alike. */
export async function verifyCredentials(email: string, password: string): Promise<User> {
  const user = await User.findOne({ where: { email: email.trim().toLowerCase() }, include: [{ model: Organization, as: 'organization' }] });
  if (!(await passwordMatches(password, user?.passwordHash ?? null)) || !user) {
    throw new HttpError(401, 'invalid_credentials', INVALID_CREDENTIALS);
  }
  if (!user.active) {
    throw new HttpError(403, 'account_inactive', 'This account has been deactivated. Ask your administrator to reactivate it.');
  }
  return user;
}

export function configurePassport() {
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      verifyCredentials(email, password).then(
        async (user) => {
          user.lastSignInAt = new Date();
          await user.save({ fields: ['lastSignInAt'] });
          done(null, user.toPublic());
        },
        (error) => (error instanceof HttpError ? done(null, false, error) : done(error)),
      );
    }),
  );
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: number, done) => {
    User.findSignedIn(id).then(
      // A deactivated or deleted account is signed out on its next request.
      (user) => done(null, user?.active ? user : false),
      done,
    );
  });
  return passport;
}
