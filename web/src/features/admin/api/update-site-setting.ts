import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SiteSettings, UpdateSettingInput } from '@shared/schemas/workbench';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export const updateSiteSetting = (input: UpdateSettingInput) => api.put<{ settings: SiteSettings }>('/api/site-settings', input);

export function useUpdateSiteSetting() {
  const qc = useQueryClient();
  // The Alarm desk reads its own copy and refreshes it within a minute.
  return useMutation({ mutationFn: updateSiteSetting, onSuccess: () => qc.invalidateQueries({ queryKey: adminKeys.siteSettings() }) });
}
