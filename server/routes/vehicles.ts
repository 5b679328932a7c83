import { route } from './route';
import { listVehicles } from '../services/vehicles.service';

// Vehicles and their gauge points are written through sync push, like every synced record.
export const vehicleRoutes = [route({ method: 'get', path: '/api/vehicles', access: 'vehicle.read', handler: async ({ auth }) => listVehicles(auth) })];
