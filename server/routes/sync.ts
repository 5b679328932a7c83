import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { pullQuery, pushRequest, resolveConflictInput } from '../../shared/schemas/sync';
import { pushBatch } from '../services/sync-push';
import { pullChanges } from '../services/sync-pull';
import { resolveConflict } from '../services/sync-conflicts';

export const syncRoutes = [
  route({
    method: 'post',
    path: '/api/sync/push',
    access: 'session.record',
    // The one bulk route: a long session's readings in one batch (every other route takes 64 kB).
    bodyLimit: 4 * 1024 * 1024,
    body: pushRequest,
    handler: async ({ auth, body }) => pushBatch(auth, body),
  }),
  route({
    method: 'get',
    path: '/api/sync/pull',
    access: 'session.read',
    query: pullQuery,
    handler: async ({ auth, query }) => pullChanges(auth, query.since, query.limit),
  }),
  route({
    method: 'post',
    path: '/api/sync/conflicts/:id/resolve',
    access: 'session.record',
    params: z.object({ id }),
    body: resolveConflictInput,
    handler: async ({ auth, params, body }) => resolveConflict(auth, params.id, body.keep),
  }),
];
