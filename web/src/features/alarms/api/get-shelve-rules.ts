import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ShelveRule } from '@shared/alarms/roles';
import type { SiteSettingsResponse } from '@shared/schemas/workbench';
import { api } from '../../../lib/api-client';
import { alarmKeys } from './alarm-keys';

/** Per site tag: may operators shelve, and the longest shelve (site settings in Plant setup). */
export const getShelveRules = async (signal?: AbortSignal): Promise<Map<string, ShelveRule>> => {
  const { sites } = await api.get<SiteSettingsResponse>('/api/site-settings', { signal });
  return new Map(sites.map((s) => [s.siteTag, { operatorsMayShelve: s.settings.operatorsMayShelve, maxShelveHours: s.settings.maxShelveHours }]));
};

export const shelveRulesQueryOptions = () => queryOptions({ queryKey: alarmKeys.shelveRules(), queryFn: ({ signal }) => getShelveRules(signal), staleTime: 60_000 });

export function useShelveRules() {
  return useQuery(shelveRulesQueryOptions());
}
