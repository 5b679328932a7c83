// Express wiring: request tracking (for draining), security headers, compression, logging, CSRF
// guard, the route table (each route loads the session, checks access, then parses its body within
// its limit), the built client, and the one error handler.
import express, { Router } from 'express';
import fs from 'node:fs';
import path from 'node:path';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { pinoHttp } from 'pino-http';
import type { Logger } from 'pino';
import { checkOrigin } from './auth/origin';
import { noStore, securityHeaders } from './http/security-headers';
import { mountRoutes } from './routes/route';
import { allRoutes } from './routes';
import { errorHandler } from './http/error-handler';
import { NotFound } from './http/errors';
import { trackRequests } from './http/lifecycle';
import { configureAnswerCache, DEFAULT_ANSWER_CACHE_BYTES } from './http/answer-cache';
import { appCompression } from './http/compress';

export interface AppOptions {
  logger: Logger;
  /** The built client (vite build output); served with an SPA fallback when present. */
  clientDir?: string;
  trustProxy?: string;
  /** Extra routers mounted after the API (e.g. the development mailbox). */
  extraRouters?: Router[];
  /** Production: HSTS and upgrade-insecure-requests (the app is served over HTTPS there). */
  production?: boolean;
  /** Memory for finished review and pull answers (http/answer-cache.ts); 64 MB unless given. */
  answerCacheBytes?: number;
}

export function createApp(opts: AppOptions) {
  const app = express();
  configureAnswerCache(opts.answerCacheBytes ?? DEFAULT_ANSWER_CACHE_BYTES);
  app.disable('x-powered-by');
  // No ETags made by hashing bodies: that costs CPU on every large answer. The routes whose
  // answers are large and often unchanged (review, pull) set a cheap validator of their own
  // from the team's change cursor (http/validator.ts).
  app.set('etag', false);
  // Set explicitly: behind a proxy, rate limits and Origin checks must see the client, not the proxy.
  app.set('trust proxy', parseTrustProxy(opts.trustProxy ?? 'false'));
  app.use(trackRequests);
  app.use(securityHeaders(opts.production ?? false));
  // gzip or brotli for answers over 1 kB (http/compress.ts; a route may compress its own faster).
  app.use(appCompression());
  app.use(
    pinoHttp({
      logger: opts.logger,
      // Probes come every few seconds from a load balancer: not worth a line each.
      autoLogging: { ignore: (req) => !req.url?.startsWith('/api') || req.url === '/api/health' || req.url === '/api/ready' },
      // One short line a request: who asked for what, the status and the time. No headers, so no
      // session id ever reaches the logs; and building a child logger with every header (the
      // default) cost about a tenth of a small signed-in request's CPU under load.
      wrapSerializers: false,
      serializers: { req: requestLine, res: responseLine },
    }),
  );

  const api = Router();
  api.use('/api', noStore);
  // Nothing reads a body here: each route parses its own after its access check (routes/route.ts).
  api.use(checkOrigin);
  mountRoutes(api, allRoutes);
  api.use('/api', (_req, _res, next) => next(new NotFound('API route')));
  app.use(api);
  for (const r of opts.extraRouters ?? []) app.use(r);

  if (opts.clientDir && fs.existsSync(path.join(opts.clientDir, 'index.html'))) {
    const dir = opts.clientDir;
    app.use(express.static(dir, { index: false, maxAge: '1h', setHeaders: cacheRules }));
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      // `root` keeps send's dotfile rule to the path below `dir`: the test build lives under .data/.
      res.sendFile('index.html', { root: dir });
    });
  }
  app.use(errorHandler);
  return app;
}

// The service worker and the HTML shell must always be revalidated so a new version is seen;
// files under assets/ carry a hash of their content in their name, so they never change.
function cacheRules(res: express.Response, file: string) {
  const base = path.basename(file);
  if (base === 'sw.js' || base === 'index.html' || base.endsWith('.webmanifest') || base.startsWith('workbox-')) {
    res.setHeader('Cache-Control', 'no-cache');
  } else if (path.basename(path.dirname(file)) === 'assets') {
    res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
  }
}

const requestLine = (req: IncomingMessage & { id?: unknown; originalUrl?: string }) => ({ id: req.id, method: req.method, url: req.originalUrl ?? req.url });
const responseLine = (res: ServerResponse) => ({ statusCode: res.statusCode });

function parseTrustProxy(v: string): boolean | number | string {
  if (v === 'true') return true;
  if (v === 'false') return false;
  if (/^\d+$/.test(v)) return Number(v);
  return v;
}
