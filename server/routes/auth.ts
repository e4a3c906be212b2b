import { Router, type Request, type Response } from 'express';
import passport from 'passport';
import { passwordResetConfirmSchema, passwordResetRequestSchema, signInSchema } from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { HttpError } from '../http/errors';
import { createLimiter } from '../http/rate-limit';
import { parseBody } from '../http/validate';
import { confirmPasswordReset, requestPasswordReset } from '../services/password-tokens';

export const SESSION_COOKIE = 'driftproof.sid';

/** Runs passport-local and signs the user in; passport regenerates the session id on sign-in. */
function signIn(req: Request, res: Response): Promise<Express.User> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', (error: unknown, user: Express.User | false, info?: HttpError) => {
      if (error) return reject(error);
      if (!user) return reject(info instanceof HttpError ? info : new HttpError(401, 'invalid_credentials', 'Sign-in failed.'));
      req.logIn(user, (loginError) => (loginError ? reject(loginError) : resolve(user)));
    })(req, res);
  });
}

export function authRoutes(ctx: AppContext) {
  const router = Router();
  const { sequelize, config } = ctx;
  const signInByAccount = createLimiter(sequelize, {
    name: 'sign-in-account',
    limit: config.signInLimit,
    windowMinutes: 15,
    failuresOnly: true,
    byEmail: true,
    message: 'Too many failed sign-ins for this account. Wait 15 minutes, or reset your password.',
  });
  const signInByAddress = createLimiter(sequelize, {
    name: 'sign-in-address',
    limit: config.signInLimit * 10,
    windowMinutes: 15,
    failuresOnly: true,
    message: 'Too many failed sign-ins from your network. Wait 15 minutes and try again.',
  });
  const resetRequests = createLimiter(sequelize, {
    name: 'password-reset',
    limit: config.resetLimit,
    windowMinutes: 60,
    message: 'Too many password reset requests. Wait an hour and try again.',
  });

  router.post('/sign-in', signInByAddress, signInByAccount, async (req, res) => {
    req.body = parseBody(signInSchema, req);
    const user = await signIn(req, res);
    req.session.signedInAt = Date.now();
    res.json({ user });
  });

  router.post('/sign-out', (req, res, next) => {
    req.logout((error) => {
      if (error) return next(error);
      req.session.destroy((destroyError) => {
        if (destroyError) return next(destroyError);
        res.clearCookie(SESSION_COOKIE, { path: '/' });
        res.status(204).end();
      });
    });
  });

  router.get('/me', guard('signed-in'), (req, res) => {
    res.json({ user: currentUser(req) });
  });

  router.post('/password-reset', resetRequests, async (req, res) => {
    const { email } = parseBody(passwordResetRequestSchema, req);
    await requestPasswordReset(ctx, email);
    res.status(202).json({ message: 'If an account exists for that e-mail, a reset link is on its way.' });
  });

  router.post('/password-reset/confirm', resetRequests, async (req, res) => {
    const { token, password } = parseBody(passwordResetConfirmSchema, req);
    await confirmPasswordReset(ctx, token, password);
    res.status(204).end();
  });

  return router;
}
