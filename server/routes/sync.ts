import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { pullQuery, pushRequest, resolveConflictInput } from '../../shared/schemas/sync';
import { pushBatch } from '../services/sync-push';
import { resolveConflict } from '../services/sync-conflicts';
import { pullJson, pullValidator, pullValidatorQuery } from '../services/pull-answer';
import { answeredNotModified } from '../http/validator';
import { sendCachedJson } from '../http/answer-cache';

export const syncRoutes = [
  route({
    method: 'post',
    path: '/api/sync/push',
    access: 'session.record',
    // The one bulk route: a long session's readings in one batch (every other route takes 64 kB).
    bodyLimit: 4 * 1024 * 1024,
    // The answer names every accepted record's id: random bytes, compressed as well at the fastest settings.
    compression: 'fast',
    body: pushRequest,
    handler: async ({ auth, body }) => pushBatch(auth, body),
  }),
  route({
    method: 'get',
    path: '/api/sync/pull',
    access: 'session.read',
    query: pullQuery,
    withSession: pullValidatorQuery,
    // Nothing changed since the phone's copy of this page: 304 after the session's one statement;
    // else the bytes this instance already sent for the same validator, or the JSON PostgreSQL builds.
    handler: async ({ auth, query, req, res, companion }) => {
      const validator = pullValidator(auth, query.since, query.limit, companion);
      if (answeredNotModified(req, res, validator.etag)) return undefined;
      await sendCachedJson(req, res, validator.key, () => pullJson(auth, query.since, query.limit));
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
