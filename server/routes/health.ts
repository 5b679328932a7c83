import { publicRoute } from './route';
import { VehicleModel } from '../models';

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
];
