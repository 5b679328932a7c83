// The route table: every API route of the server, in one list. The access-matrix test walks it.
import type { AnyRoute } from './route';
import { healthRoutes } from './health';
import { authRoutes } from './auth';
import { vehicleRoutes } from './vehicles';
import { sessionRoutes } from './sessions';

export const allRoutes: AnyRoute[] = [...healthRoutes, ...authRoutes, ...vehicleRoutes, ...sessionRoutes];
