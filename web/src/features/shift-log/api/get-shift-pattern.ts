import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ShiftPatternView } from '@shared/schemas/shifts';
import { api } from '../../../lib/api-client';
import { shiftLogKeys } from './shift-log-keys';

export function getShiftPattern(signal?: AbortSignal): Promise<ShiftPatternView> {
  return api.get<{ pattern: ShiftPatternView }>('/api/shifts/pattern', { signal }).then((r) => r.pattern);
}

export const shiftPatternQueryOptions = () =>
  queryOptions({ queryKey: shiftLogKeys.pattern(), queryFn: ({ signal }) => getShiftPattern(signal), staleTime: 5 * 60_000 });

export function useShiftPattern() {
  return useQuery(shiftPatternQueryOptions());
}
