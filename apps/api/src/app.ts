/**
 * Builds the Express app (no listening here: server.ts listens, tests hand the app to supertest).
 */
import express, { type Express, type RequestHandler } from 'express';
import helmet from 'helmet';
import { rateLimit } from 'express-rate-limit';
import { pinoHttp } from 'pino-http';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import type { AppContext } from './context';
import { ApiRouter } from './http/route';
import { createRegistry, buildOpenApiDocument } from './http/openapi';
import { errorBody, errorHandler, notFoundHandler } from './http/errors';
import { csrfProtection } from './auth/csrf';
import { createPassport, createSessionMiddleware, type PassportInstance } from './auth/session';
import { registerAuthRoutes } from './auth/auth.routes';
import { registerAdminRoutes } from './admin/admin.routes';
import { registerProjectRoutes } from './projects/projects.routes';
import { registerMaterialRoutes } from './materials/materials.routes';
import { registerStudyRoutes } from './studies/studies.routes';
import { registerMeshRoutes } from './meshes/meshes.routes';
import { registerRunRoutes } from './runs/runs.routes';
import { registerCommentRoutes } from './comments/comments.routes';
import { registerTestDataRoutes } from './testdata/testdata.routes';
import { registerHealthRoutes } from './health/health.routes';
import { registerNotificationRoutes } from './notifications/notifications.routes';
import { registerTokenRoutes } from './tokens/tokens.routes';
import { bearerTokenAuth } from './tokens/tokens.service';
import { API_VERSION } from './version';

export interface BuiltApp {
  app: Express;
  /** Shared with Socket.IO so sockets know their user. */
  sessionMiddleware: RequestHandler;
  passport: PassportInstance;
}

export function createApp(ctx: AppContext): BuiltApp {
  const app = express();
  const registry = createRegistry();
  const passport = createPassport();
  const sessionMiddleware = createSessionMiddleware(ctx.pool, ctx.config.SESSION_SECRET, ctx.config.APP_URL.startsWith('https:'), ctx.config.SESSION_IDLE_MINUTES);

  app.disable('x-powered-by');
  app.set('query parser', 'extended');
  if (ctx.config.NODE_ENV !== 'test') app.use(pinoHttp({ logger: ctx.logger, autoLogging: { ignore: (req) => req.url === '/api/health' } }));
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          // Element Plus and ECharts set inline styles; three.js and ECharts draw to blob/data images.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          workerSrc: ["'self'", 'blob:'],
          connectSrc: ["'self'", 'ws:', 'wss:'],
          fontSrc: ["'self'", 'data:'],
        },
      },
    }),
  );
  app.use(express.json({ limit: '10mb' }));
  app.use(sessionMiddleware);
  app.use(passport.initialize());
  app.use(passport.session());
  app.use('/api', bearerTokenAuth(ctx.pool));
  app.use('/api', csrfProtection);

  // Failed sign-ins per address and minute; successful ones do not count.
  const loginLimiter = rateLimit({
    windowMs: 60_000,
    limit: ctx.config.LOGIN_FAILURES_PER_MINUTE,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res) => {
      res.status(429).json(errorBody('rate_limited', 'Too many failed sign-ins; wait a minute and try again'));
    },
  });
  app.use('/api/auth/login', loginLimiter);
  // Reset mails cost a mail each: a looser cap on requests of any outcome.
  app.use('/api/auth/password-reset/request', rateLimit({
    windowMs: 60_000, limit: 20, standardHeaders: 'draft-8', legacyHeaders: false,
    handler: (_req, res) => {
      res.status(429).json(errorBody('rate_limited', 'Too many reset requests; wait a minute and try again'));
    },
  }));

  const api = new ApiRouter('/api', registry);
  registerHealthRoutes(api, ctx, API_VERSION);
  registerAuthRoutes(api, ctx, passport);
  registerAdminRoutes(api, ctx);
  registerProjectRoutes(api, ctx);
  registerMaterialRoutes(api, ctx);
  registerTestDataRoutes(api, ctx);
  registerStudyRoutes(api, ctx);
  registerMeshRoutes(api, ctx);
  registerRunRoutes(api, ctx);
  registerCommentRoutes(api, ctx);
  registerNotificationRoutes(api, ctx);
  registerTokenRoutes(api, ctx);

  const openApi = buildOpenApiDocument(registry, API_VERSION);
  app.get('/api/openapi.json', (_req, res) => {
    res.json(openApi);
  });
  app.use('/api', api.router);
  app.use('/api', notFoundHandler);

  serveWebApp(app, ctx.config.WEB_DIST);
  app.use(notFoundHandler);
  app.use(errorHandler(ctx.logger));
  return { app, sessionMiddleware, passport };
}

/** The built single-page app, with every unknown non-API path answered by index.html (client routes). */
function serveWebApp(app: Express, dist: string): void {
  if (!dist) return;
  const root = resolve(dist);
  if (!existsSync(resolve(root, 'index.html'))) return;
  app.use(express.static(root, { index: false, maxAge: '1h' }));
  app.get(/^(?!\/api\/|\/socket\.io\/).*/, (_req, res) => {
    res.sendFile(resolve(root, 'index.html'));
  });
}
