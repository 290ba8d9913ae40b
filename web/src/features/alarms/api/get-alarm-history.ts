import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AlarmView } from '@shared/schemas/alarms';
import { api, withQuery } from '../../../lib/api-client';
import { alarmKeys, type HistoryParams } from './alarm-keys';

export const HISTORY_PAGE = 100;
const params = (p: HistoryParams) => ({ ...p, limit: HISTORY_PAGE });

export const getAlarmHistory = (p: HistoryParams, signal?: AbortSignal) =>
  api.get<{ alarms: AlarmView[]; total: number }>(withQuery('/api/alarms/history', params(p)), { signal });

/** Same filters as the search, as a CSV download (the browser sends the session cookie). */
export const alarmHistoryCsvUrl = (p: HistoryParams) => withQuery('/api/alarms/history/export', { ...p, offset: undefined });

export const alarmHistoryQueryOptions = (p: HistoryParams) =>
  queryOptions({ queryKey: alarmKeys.history(p), queryFn: ({ signal }) => getAlarmHistory(p, signal), placeholderData: keepPreviousData });

export function useAlarmHistory(p: HistoryParams | null) {
  return useQuery({ ...alarmHistoryQueryOptions(p ?? { from: '', to: '' }), enabled: p !== null });
}
