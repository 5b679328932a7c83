// The route table: every API route of the server, in one list. The access-matrix test walks it.
import type { AnyRoute } from './route';
import { healthRoutes } from './health';
import { authRoutes } from './auth';
import { vehicleRoutes } from './vehicles';
import { sessionRoutes } from './sessions';
import { teamRoutes } from './team';
import { syncRoutes } from './sync';
import { photoRoutes } from './photos';
import { reviewRoutes } from './review';
import { envelopeRoutes } from './envelopes';
import { compareRoutes } from './compare';
import { exportRoutes } from './exports';

export const allRoutes: AnyRoute[] = [
  ...healthRoutes,
  ...authRoutes,
  ...teamRoutes,
  ...vehicleRoutes,
  ...sessionRoutes,
  ...syncRoutes,
  ...photoRoutes,
  ...reviewRoutes,
  ...envelopeRoutes,
  ...compareRoutes,
  ...exportRoutes,
];
