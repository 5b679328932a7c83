import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { getSessionDetail, listSessions } from '../services/sessions.service';

export const sessionRoutes = [
  route({ method: 'get', path: '/api/sessions', access: 'session.read', handler: async ({ auth }) => listSessions(auth) }),
  route({
    method: 'get',
    path: '/api/sessions/:id',
    access: 'session.read',
    params: z.object({ id }),
    handler: async ({ auth, params }) => getSessionDetail(auth, params.id),
  }),
];
