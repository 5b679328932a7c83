import * as z from 'zod';
import { route } from './route';
import { gaugePoint, id, vehicle } from '../../shared/schemas';
import { createVehicle, getVehicle, listVehicles, setGaugePoints, updateVehicle } from '../services/vehicles.service';

const byId = z.object({ id });
const newVehicle = vehicle.omit({ version: true, deletedAt: true });
const pointsInput = z.object({
  gaugePoints: z.array(gaugePoint.omit({ version: true, deletedAt: true, vehicleId: true })).max(64),
});

export const vehicleRoutes = [
  route({ method: 'get', path: '/api/vehicles', access: 'vehicle.read', handler: async ({ auth }) => listVehicles(auth) }),
  route({
    method: 'get',
    path: '/api/vehicles/:id',
    access: 'vehicle.read',
    params: byId,
    handler: async ({ auth, params }) => getVehicle(auth, params.id),
  }),
  route({
    method: 'post',
    path: '/api/vehicles',
    access: 'vehicle.write',
    body: newVehicle,
    handler: async ({ auth, body, res }) => {
      res.status(201);
      return createVehicle(auth, body);
    },
  }),
  route({
    method: 'put',
    path: '/api/vehicles/:id',
    access: 'vehicle.write',
    params: byId,
    body: vehicle.omit({ id: true, deletedAt: true }),
    handler: async ({ auth, params, body }) => updateVehicle(auth, params.id, body),
  }),
  route({
    method: 'put',
    path: '/api/vehicles/:id/gauge-points',
    access: 'vehicle.write',
    params: byId,
    body: pointsInput,
    handler: async ({ auth, params, body }) => setGaugePoints(auth, params.id, body.gaugePoints),
  }),
];
