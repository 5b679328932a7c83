import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { readingReviewInput } from '../../shared/schemas/envelope';
import { getReview, reviewReading } from '../services/review.service';

const byId = z.object({ id });

export const reviewRoutes = [
  route({
    method: 'get',
    path: '/api/sessions/:id/review',
    access: 'session.review',
    params: byId,
    handler: async ({ auth, params }) => getReview(auth, params.id),
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
