import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Vehicle } from '@shared/schemas';
import type { VehicleDesk } from '@shared/desk-responses';
import { api } from '@/lib/api-client';

export const getVehicles = () => api<Vehicle[]>('/api/vehicles');
export const getVehicleDesk = (id: string) => api<VehicleDesk>(`/api/vehicles/${id}`);

export const vehicleQueries = {
  all: () => ['vehicles'] as const,
  list: () => queryOptions({ queryKey: [...vehicleQueries.all(), 'list'], queryFn: getVehicles }),
  /** One vehicle at the desk: gauge points, sessions and their envelope revisions. */
  desk: (id: string) => queryOptions({ queryKey: [...vehicleQueries.all(), 'desk', id], queryFn: () => getVehicleDesk(id) }),
};

export const useVehicles = () => useQuery(vehicleQueries.list());
export const useVehicleDesk = (id: string) => useQuery(vehicleQueries.desk(id));
