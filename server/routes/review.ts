import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { readingReviewInput } from '../../shared/schemas/envelope';
import { getReviewJson, reviewReading, reviewValidator, reviewValidatorQuery } from '../services/review.service';
import { answeredNotModified } from '../http/validator';
import { sendCachedJson } from '../http/answer-cache';

const byId = z.object({ id });

export const reviewRoutes = [
  route({
    method: 'get',
    path: '/api/sessions/:id/review',
    access: 'session.review',
    params: byId,
    withSession: ({ params }) => reviewValidatorQuery(params.id),
    // Unchanged since the client's copy: 304 after the session's one statement; else the bytes
    // this instance already sent for the same validator, or the JSON PostgreSQL builds.
    handler: async ({ auth, params, req, res, companion }) => {
      const validator = reviewValidator(auth, params.id, companion);
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
