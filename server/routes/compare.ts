import { route } from './route';
import { compareQuery } from '../../shared/schemas/envelope';
import { compare } from '../services/compare.service';

export const compareRoutes = [
  route({
    method: 'get',
    path: '/api/compare',
    access: 'envelope.read',
    query: compareQuery,
    handler: async ({ auth, query }) => compare(auth, query.sessionIds),
  }),
];
