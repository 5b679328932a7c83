import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { pullQuery, pushRequest, resolveConflictInput } from '../../shared/schemas/sync';
import { pushBatch } from '../services/sync-push';
import { resolveConflict } from '../services/sync-conflicts';
import { currentPullEtag, pullJson } from '../services/pull-answer';
import { answeredNotModified, sendJsonText } from '../http/validator';

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
    // Nothing changed since the phone's copy of this page: 304 after one small query; else the
    // JSON PostgreSQL built, with the validator of the state it was read from.
    handler: async ({ auth, query, req, res }) => {
      if (answeredNotModified(req, res, await currentPullEtag(auth, query.since, query.limit))) return undefined;
      const { body, etag } = await pullJson(auth, query.since, query.limit);
      res.setHeader('ETag', etag);
      sendJsonText(res, body);
      return undefined;
    },
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
