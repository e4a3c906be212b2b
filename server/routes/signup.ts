import { Router } from 'express';
import { employerSignupSchema, tokenSchema } from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { createLimiter } from '../http/rate-limit';
import { parseBody } from '../http/validate';
import { confirmEmail, resendConfirmation, signUpEmployer } from '../services/signup';

export function signupRoutes(ctx: AppContext) {
  const router = Router();
  const signups = createLimiter(ctx.sequelize, { name: 'signup', limit: 10, windowMinutes: 60, message: 'Too many sign-ups from your network. Wait an hour and try again.' });

  router.post('/signup', signups, async (req, res) => {
    const user = await signUpEmployer(ctx, parseBody(employerSignupSchema, req));
    res.status(201).json({ user, message: 'Check your e-mail: confirm the address to start buying seats.' });
  });

  router.post('/signup/confirm', signups, async (req, res) => {
    await confirmEmail(ctx, parseBody(tokenSchema, req).token);
    res.status(204).end();
  });

  router.post('/signup/resend-confirmation', guard(['employer']), async (req, res) => {
    await resendConfirmation(ctx, currentUser(req).id);
    res.status(202).json({ message: 'A new confirmation link is on its way.' });
  });

  return router;
}
