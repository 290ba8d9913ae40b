import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SiteSettingsResponse } from '@shared/schemas/workbench';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export const getSiteSettings = (signal?: AbortSignal) => api.get<SiteSettingsResponse>('/api/site-settings', { signal }).then((r) => r.sites);

export const siteSettingsQueryOptions = () => queryOptions({ queryKey: adminKeys.siteSettings(), queryFn: ({ signal }) => getSiteSettings(signal) });

export function useSiteSettings() {
  return useQuery(siteSettingsQueryOptions());
}
