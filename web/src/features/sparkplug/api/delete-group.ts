import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sparkplugKeys } from './sparkplug-keys';

export function deleteGroup(id: number): Promise<void> {
  return api.delete(`/api/admin/sparkplug/groups/${id}`);
}

export function useDeleteGroup() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: deleteGroup, onSuccess: () => qc.invalidateQueries({ queryKey: sparkplugKeys.all }) });
}
