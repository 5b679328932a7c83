import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { readingReviewInput } from '../../shared/schemas/envelope';
import { getReviewJson, reviewReading, reviewValidator } from '../services/review.service';
import { answeredNotModified } from '../http/validator';
import { sendCachedJson } from '../http/answer-cache';

const byId = z.object({ id });

export const reviewRoutes = [
  route({
    method: 'get',
    path: '/api/sessions/:id/review',
    access: 'session.review',
    params: byId,
    // Unchanged since the client's copy: 304 after one small query; else the bytes this instance
    // already sent for the same validator, or the JSON PostgreSQL builds.
    handler: async ({ auth, params, req, res }) => {
      const validator = await reviewValidator(auth, params.id);
      if (answeredNotModified(req, res, validator.etag)) return undefined;
      await sendCachedJson(req, res, validator.key, () => getReviewJson(auth, params.id));
      return undefined;
    },
  }),
  route({
    method: 'patch',
    path: '/api/readings/:id/review',
    access: 'session.review',
    params: byId,
    body: readingReviewInput,
    handler: async ({ auth, params, body }) => reviewReading(auth, params.id, body),
  }),
];
