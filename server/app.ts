/**
 * The Express app, without listening: server/index.ts listens, tests use supertest on it.
 * Order: security headers → JSON body → session → passport → API routes → client → errors.
 */
import { existsSync } from 'node:fs';
import path from 'node:path';
import express from 'express';
import session from 'express-session';
import helmet from 'helmet';
import { configurePassport } from './auth/passport';
import { PROJECT_ROOT } from './config';
import type { AppContext } from './context';
import { errorHandler, HttpError } from './http/errors';
import { sameOriginOnly } from './http/same-origin';
import { absoluteSessionLimit, IDLE_HOURS } from './http/session-limits';
import { attemptRoutes } from './routes/attempts';
import { authRoutes, SESSION_COOKIE } from './routes/auth';
import { credentialRoutes } from './routes/credentials';
import { fleetRoutes } from './routes/fleet';
import { healthRoutes } from './routes/health';
import { mailMessageRoutes } from './routes/mail-messages';
import { organizationRoutes } from './routes/organizations';
import { paymentRoutes, paymentWebhookRoute } from './routes/payments';
import { reviewRoutes } from './routes/reviews';
import { signupRoutes } from './routes/signup';
import { trialRoutes } from './routes/trials';
import { userRoutes } from './routes/users';

export const CLIENT_DIR = path.join(PROJECT_ROOT, 'dist');

/** The app's own origin, its loopback twin (localhost ↔ 127.0.0.1), and in development the Vite dev server. */
function allowedOrigins(config: AppContext['config']): string[] {
  const origins = [config.appUrl];
  const url = new URL(config.appUrl);
  const twin = url.hostname === '127.0.0.1' ? 'localhost' : url.hostname === 'localhost' ? '127.0.0.1' : null;
  if (twin) origins.push(`${url.protocol}//${twin}${url.port ? `:${url.port}` : ''}`);
  if (config.env === 'development') origins.push('http://127.0.0.1:5173', 'http://localhost:5173');
  return origins;
}

export function createApp(ctx: AppContext) {
  const { config } = ctx;
  const secure = config.appUrl.startsWith('https://');
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy);

  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Helmet adds upgrade-insecure-requests; over plain http on loopback it would break every fetch.
          upgradeInsecureRequests: secure ? [] : null,
          imgSrc: ["'self'", 'data:', 'blob:'],
        },
      },
    }),
  );
  // Signed webhooks are verified on their raw bytes, so this route comes before the JSON parser.
  app.use('/api', paymentWebhookRoute(ctx));
  app.use('/api', sameOriginOnly(allowedOrigins(config)));
  app.use(express.json({ limit: '100kb' }));
  app.use(
    session({
      name: SESSION_COOKIE,
      store: ctx.sessionStore,
      secret: config.sessionSecret,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      proxy: secure,
      cookie: { httpOnly: true, sameSite: 'lax', secure, maxAge: IDLE_HOURS * 3_600_000 },
    }),
  );
  app.use(absoluteSessionLimit());
  const passport = configurePassport();
  app.use(passport.initialize());
  app.use(passport.session());

  const api = express.Router();
  api.use('/auth', authRoutes(ctx));
  api.use(healthRoutes(ctx));
  api.use(userRoutes(ctx));
  api.use(mailMessageRoutes());
  api.use(trialRoutes(ctx));
  api.use(attemptRoutes(ctx));
  api.use(reviewRoutes(ctx));
  api.use(signupRoutes(ctx));
  api.use(paymentRoutes(ctx));
  api.use(organizationRoutes(ctx));
  api.use(credentialRoutes(ctx));
  api.use(fleetRoutes(ctx));
  api.use((req, _res, next) => next(new HttpError(404, 'not_found', `No API route for ${req.method} ${req.path}.`)));
  app.use('/api', api);

  if (existsSync(path.join(CLIENT_DIR, 'index.html'))) {
    app.use(express.static(CLIENT_DIR, { index: false, maxAge: '1h' }));
    // The client routes in the browser: every other GET gets the app's page. (dotfiles: a checkout
    // under a folder whose name starts with a dot must still serve it.)
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(CLIENT_DIR, 'index.html'), { dotfiles: 'allow' }));
  }

  app.use(errorHandler);
  return app;
}
