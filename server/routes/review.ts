import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { readingReviewInput } from '../../shared/schemas/envelope';
import { getReviewJson, reviewEtag, reviewReading } from '../services/review.service';
import { answeredNotModified, sendJsonText } from '../http/validator';

const byId = z.object({ id });

export const reviewRoutes = [
  route({
    method: 'get',
    path: '/api/sessions/:id/review',
    access: 'session.review',
    params: byId,
    // Unchanged since the client's copy: 304 after one small query; else the JSON PostgreSQL built.
    handler: async ({ auth, params, req, res }) => {
      if (answeredNotModified(req, res, await reviewEtag(auth, params.id))) return undefined;
      sendJsonText(res, await getReviewJson(auth, params.id));
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
