import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SparkplugSetup } from '@shared/schemas/sparkplug';
import { api } from '../../../lib/api-client';
import { sparkplugKeys } from './sparkplug-keys';

export function getSparkplug(signal?: AbortSignal): Promise<SparkplugSetup> {
  return api.get<SparkplugSetup>('/api/admin/sparkplug', { signal });
}

// The event list (births, deaths, rebirth requests) is worth a refresh while the page is open.
export const sparkplugQueryOptions = () =>
  queryOptions({ queryKey: sparkplugKeys.setup(), queryFn: ({ signal }) => getSparkplug(signal), refetchInterval: 10_000 });

export function useSparkplug() {
  return useQuery(sparkplugQueryOptions());
}
