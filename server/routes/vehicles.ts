import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { getVehicle, listVehicles } from '../services/vehicles.service';

const byId = z.object({ id });

// Vehicles and their gauge points are written through sync push, like every synced record.
export const vehicleRoutes = [
  route({ method: 'get', path: '/api/vehicles', access: 'vehicle.read', handler: async ({ auth }) => listVehicles(auth) }),
  route({
    method: 'get',
    path: '/api/vehicles/:id',
    access: 'vehicle.read',
    params: byId,
    handler: async ({ auth, params }) => getVehicle(auth, params.id),
  }),
];
