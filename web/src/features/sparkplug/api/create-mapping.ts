import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SparkplugMappingCreate } from '@shared/schemas/sparkplug';
import { api } from '../../../lib/api-client';
import { sparkplugKeys } from './sparkplug-keys';

export function createMapping(input: SparkplugMappingCreate): Promise<{ id: number }> {
  return api.post<{ id: number }>('/api/admin/sparkplug/mappings', input);
}

export function useCreateMapping() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createMapping, onSuccess: () => qc.invalidateQueries({ queryKey: sparkplugKeys.all }) });
}
