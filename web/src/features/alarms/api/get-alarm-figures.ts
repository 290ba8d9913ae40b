import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AlarmFigures } from '@shared/alarms/figures';
import type { ALARM_TARGETS } from '@shared/alarms/targets';
import { api, withQuery } from '../../../lib/api-client';
import { alarmKeys, type FiguresParams } from './alarm-keys';

export type FiguresResponse = { figures: AlarmFigures; targets: typeof ALARM_TARGETS };

export const getAlarmFigures = (p: FiguresParams, signal?: AbortSignal) => api.get<FiguresResponse>(withQuery('/api/alarms/figures', p), { signal });

export const alarmFiguresQueryOptions = (p: FiguresParams) =>
  queryOptions({ queryKey: alarmKeys.figures(p), queryFn: ({ signal }) => getAlarmFigures(p, signal), staleTime: 60_000 });

export function useAlarmFigures(p: FiguresParams) {
  return useQuery(alarmFiguresQueryOptions(p));
}
