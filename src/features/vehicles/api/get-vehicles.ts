import { useQuery } from '@tanstack/react-query';
import type { Vehicle } from '@shared/schemas';
import { api } from '@/lib/api-client';

export const vehicleKeys = {
  all: ['vehicles'] as const,
  list: () => [...vehicleKeys.all, 'list'] as const,
  detail: (id: string) => [...vehicleKeys.all, 'detail', id] as const,
};

export const getVehicles = () => api<Vehicle[]>('/api/vehicles');

export function useVehicles() {
  return useQuery({ queryKey: vehicleKeys.list(), queryFn: getVehicles });
}
