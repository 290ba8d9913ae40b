import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SparkplugGroupCreate } from '@shared/schemas/sparkplug';
import { api } from '../../../lib/api-client';
import { sparkplugKeys } from './sparkplug-keys';

export function createGroup(input: SparkplugGroupCreate): Promise<{ id: number }> {
  return api.post<{ id: number }>('/api/admin/sparkplug/groups', input);
}

export function useCreateGroup() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createGroup, onSuccess: () => qc.invalidateQueries({ queryKey: sparkplugKeys.all }) });
}
