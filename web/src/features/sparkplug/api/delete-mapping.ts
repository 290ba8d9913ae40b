import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sparkplugKeys } from './sparkplug-keys';

export function deleteMapping(id: number): Promise<void> {
  return api.delete(`/api/admin/sparkplug/mappings/${id}`);
}

export function useDeleteMapping() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: deleteMapping, onSuccess: () => qc.invalidateQueries({ queryKey: sparkplugKeys.all }) });
}
