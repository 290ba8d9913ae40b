import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ApplyTemplateInput } from '@shared/schemas/alarms';
import { api } from '../../../lib/api-client';
import { alarmKeys } from './alarm-keys';

/** Creates the template's definitions the tanks lack; answers the new definitions' ids. */
export const applyTemplate = (input: ApplyTemplateInput) => api.post<{ created: number[] }>('/api/alarms/templates/apply', input);

export function useApplyTemplate() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: applyTemplate, onSuccess: () => qc.invalidateQueries({ queryKey: alarmKeys.definitionLists() }) });
}
