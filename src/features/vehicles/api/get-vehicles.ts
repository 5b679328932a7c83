import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Vehicle } from '@shared/schemas';
import { api } from '@/lib/api-client';

export const getVehicles = () => api<Vehicle[]>('/api/vehicles');

export const vehicleQueries = {
  all: () => ['vehicles'] as const,
  list: () => queryOptions({ queryKey: [...vehicleQueries.all(), 'list'], queryFn: getVehicles }),
};

export const useVehicles = () => useQuery(vehicleQueries.list());
