// An instance's life behind a load balancer: it is ready for traffic once it has started (its
// migrations are done) and while the database and the photo store answer; on SIGTERM it stops
// being ready, stops accepting connections, finishes the requests it has, then exits.
//
// `/api/health` says the process is alive and its database answers (liveness); `/api/ready` says
// it may take traffic now (readiness): a proxy sends requests only to ready instances.
import type http from 'node:http';
import type { RequestHandler } from 'express';
import { VehicleModel } from '../models';
import { photoStore } from '../storage/photo-store';

type State = 'starting' | 'ready' | 'draining';
let state: State = 'starting';
let inFlight = 0;
const idleWaiters = new Set<() => void>();

export const lifecycle = {
  get state() {
    return state;
  },
  get inFlight() {
    return inFlight;
  },
  /** Called once the instance listens with its migrations done. */
  markReady() {
    if (state === 'starting') state = 'ready';
  },
};

/** Counts requests in flight; while draining, each answer closes its connection. */
export const trackRequests: RequestHandler = (_req, res, next) => {
  inFlight += 1;
  if (state === 'draining') res.setHeader('Connection', 'close');
  res.once('close', () => {
    inFlight -= 1;
    if (inFlight === 0) for (const wake of [...idleWaiters]) wake();
  });
  next();
};

/** What /api/ready answers: 200 only when started, not draining, and the database and photo store answer. */
export async function readiness(): Promise<{ status: number; body: Record<string, unknown> }> {
  if (state !== 'ready') return { status: 503, body: { ready: false, state } };
  const [database, photos] = await Promise.all([
    VehicleModel.sequelize!.query('SELECT 1').then(
      () => 'up',
      () => 'down',
    ),
    photoStore()
      .check()
      .then(
        () => 'up',
        () => 'down',
      ),
  ]);
  const ok = database === 'up' && photos === 'up';
  return { status: ok ? 200 : 503, body: { ready: ok, state, database, photos } };
}

/**
 * Drain: no longer ready at once; after `delayMs` (time for a load balancer's next readiness
 * probe to take the instance out, still serving meanwhile) no new connections, idle keep-alive
 * connections closed, and the requests in flight finished (up to `timeoutMs`, then cut).
 */
export async function drain(server: http.Server, { delayMs, timeoutMs }: { delayMs: number; timeoutMs: number }): Promise<{ cut: number }> {
  state = 'draining';
  if (delayMs > 0) await new Promise((resolve) => setTimeout(resolve, delayMs));
  const closed = new Promise<void>((resolve) => server.close(() => resolve()));
  server.closeIdleConnections();
  const idle = new Promise<void>((resolve) => {
    if (inFlight === 0) return resolve();
    const wake = () => (idleWaiters.delete(wake), resolve());
    idleWaiters.add(wake);
  });
  let timer: NodeJS.Timeout | undefined;
  const timedOut = new Promise<'timeout'>((resolve) => (timer = setTimeout(() => resolve('timeout'), timeoutMs)));
  const outcome = await Promise.race([idle, timedOut]);
  clearTimeout(timer);
  const cut = outcome === 'timeout' ? inFlight : 0;
  // Finished answers may leave keep-alive connections open a moment; close what is left.
  server.closeAllConnections();
  await closed;
  return { cut };
}
