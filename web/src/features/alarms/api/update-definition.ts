import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DefinitionView, UpdateDefinitionInput } from '@shared/schemas/alarms';
import { api } from '../../../lib/api-client';
import { alarmKeys } from './alarm-keys';

export const updateDefinition = ({ id, input }: { id: number; input: UpdateDefinitionInput }) =>
  api.patch<{ definition: DefinitionView }>(`/api/alarms/definitions/${id}`, input).then((r) => r.definition);

/** The server records the reason with the before and after settings. */
export function useUpdateDefinition() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updateDefinition, onSuccess: () => qc.invalidateQueries({ queryKey: alarmKeys.definitionLists() }) });
}
