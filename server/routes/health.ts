import { publicRoute } from './route';
import { VehicleModel } from '../models';
import { readiness } from '../http/lifecycle';

export const healthRoutes = [
  publicRoute({
    method: 'get',
    path: '/api/health',
    access: 'public',
    // Answers from the database alone: a session cookie must not need a look-up that fails first.
    session: false,
    handler: async ({ res }) => {
      try {
        await VehicleModel.sequelize!.query('SELECT 1');
        return { ok: true, database: 'up' };
      } catch {
        res.status(503);
        return { ok: false, database: 'down' };
      }
    },
  }),
  // Readiness for a load balancer (http/lifecycle.ts): 503 while starting, while draining after
  // SIGTERM, or when the database or the photo store does not answer.
  publicRoute({
    method: 'get',
    path: '/api/ready',
    access: 'public',
    session: false,
    handler: async ({ res }) => {
      const { status, body } = await readiness();
      res.status(status);
      return body;
    },
  }),
];
