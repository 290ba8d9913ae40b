import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CircuitTemplate } from '@shared/alarms/templates';
import { api } from '../../../lib/api-client';
import { alarmKeys } from './alarm-keys';

export const getTemplates = (signal?: AbortSignal) => api.get<{ templates: CircuitTemplate[] }>('/api/alarms/templates', { signal }).then((r) => r.templates);

// Templates ship with the release; they do not change while the page is open.
export const templatesQueryOptions = () => queryOptions({ queryKey: alarmKeys.templates(), queryFn: ({ signal }) => getTemplates(signal), staleTime: Infinity });

export function useTemplates() {
  return useQuery(templatesQueryOptions());
}
