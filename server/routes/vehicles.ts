import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { getVehicleDesk, listVehicles } from '../services/vehicles.service';

// Vehicles and their gauge points are written through sync push, like every synced record.
export const vehicleRoutes = [
  route({ method: 'get', path: '/api/vehicles', access: 'vehicle.read', handler: async ({ auth }) => listVehicles(auth) }),
  route({
    method: 'get',
    path: '/api/vehicles/:id',
    access: 'vehicle.read',
    params: z.object({ id }),
    handler: async ({ auth, params }) => getVehicleDesk(auth, params.id),
  }),
];
