import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import type { Kysely } from 'kysely';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';
import { apiRouteModules } from './api-route-modules';
import { authRoutes } from './auth/auth-routes';
import { createPassport } from './auth/create-passport';
import { KyselySessionStore } from './auth/kysely-session-store';
import { sessionCookieName } from './auth/session-cookie-name';
import type { Clock } from './clock';
import type { Config } from './config/config';
import type { Database } from './db/database';
import { AppError } from './errors/app-error';
import { errorHandler } from './errors/error-handler';
import { csrfProtection } from './http/csrf-protection';
import { createApiRoutes, type RegisteredRoute } from './http/define-route';
import type { RouteModule } from './http/route-module';
import { serveWebApp } from './http/serve-web-app';
import { keepRawBody, paymentWebhookPath } from './payments/raw-body';

// base64 SHA-256 of the handler text this.media='all', per CSP Level 3 hash-source
const stylesheetOnloadHash = 'MhtPZXr7+LpJUY5qtMutB+qWfQtMaPccfe7QXtCcEYc=';

export { sessionCookieName };

export interface AppDeps {
  db: Kysely<Database>;
  config: Config;
  clock: Clock;
  logger: Logger;
  /** Folder of the built web app; defaults to config.webRoot. */
  webRoot?: string;
  /** Route modules to register; defaults to every module of the product. */
  routeModules?: readonly RouteModule[];
}

const registries = new WeakMap<Express, readonly RegisteredRoute[]>();

/** The routes an app declared, with their roles (for the authorization matrix and the route table). */
export function routeRegistryOf(app: Express): readonly RegisteredRoute[] {
  const registry = registries.get(app);
  if (!registry) throw new Error('Not an app made by createApp');
  return registry;
}

/**
 * Builds the Express app without listening: security headers, request log, sessions, CSRF, the declared API routes,
 * problem documents for every error, and the web app.
 *
 * @example
 * const app = createApp({ db, config, clock: systemClock, logger });
 * app.listen(config.port, config.host);
 */
export function createApp(deps: AppDeps): Express {
  const { db, config, clock, logger } = deps;
  const app = express();
  app.disable('x-powered-by');
  // paths mean what they spell: /API/orders is not /api/orders, so no check keyed on a path can be side-stepped by case
  app.enable('case sensitive routing');
  // only proxies named in TRUST_PROXY may say who the client is; otherwise X-Forwarded-For is ignored, so a client
  // reaching the port directly cannot pick its own address and slip past the per-address limits
  if (config.trustProxy !== false) app.set('trust proxy', config.trustProxy);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          // the production build's critical-CSS step loads the full stylesheet with onload="this.media='all'"
          // (@angular/build inline-critical-css); 'unsafe-hashes' allows exactly that one handler, nothing else inline
          scriptSrc: ["'self'", "'unsafe-hashes'", `'sha256-${stylesheetOnloadHash}'`],
          // Angular inserts component styles as <style> elements at run time, so inline styles must be allowed
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'"],
          // data: and blob: for previews and downloads made in the page
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          workerSrc: ["'self'", 'blob:'],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
          ...(config.secureCookies ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      // HSTS only makes sense when served over https
      strictTransportSecurity: config.secureCookies,
    }),
  );
  app.use(pinoHttp({ logger, quietReqLogger: true }));

  app.use(
    session({
      name: sessionCookieName,
      secret: config.sessionSecret,
      store: new KyselySessionStore(db, clock, config.sessionMaxAgeMs),
      resave: false,
      saveUninitialized: false,
      rolling: true,
      // with no trusted proxy, an https PUBLIC_URL still needs to know the request reached the proxy over https to
      // send its Secure cookie; X-Forwarded-Proto says so, and a client that forges it only withholds its own cookie
      ...(config.trustProxy === false && config.secureCookies ? { proxy: true } : {}),
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: config.secureCookies,
        maxAge: config.sessionMaxAgeMs,
        path: '/',
      },
    }),
  );
  const passport = createPassport(db);
  app.use(passport.initialize());
  app.use(passport.session());
  // the payment provider's events carry a signature instead of a CSRF token, over the exact bytes kept here
  app.use(
    csrfProtection({
      secret: config.sessionSecret,
      secure: config.secureCookies,
      exemptPaths: [paymentWebhookPath],
    }),
  );
  app.use('/api', express.json({ limit: config.jsonBodyLimitBytes, verify: keepRawBody }));

  const { api, router } = createApiRoutes();
  const context = { db, config, clock, logger };
  authRoutes(passport)(api, context);
  for (const module of deps.routeModules ?? apiRouteModules) module(api, context);
  app.use(router);
  registries.set(app, api.registry);

  app.use('/api', (req, _res, next) => {
    next(new AppError('not-found', 404, `No API route ${req.method} ${req.originalUrl}.`));
  });
  serveWebApp(app, deps.webRoot ?? config.webRoot);
  app.use((req, _res, next) => next(new AppError('not-found', 404, `Nothing at ${req.originalUrl}.`)));
  app.use(errorHandler());
  return app;
}
