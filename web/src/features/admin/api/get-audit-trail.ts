import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditPage, AuditQuery } from '@shared/schemas/audit';
import { api, withQuery } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export function getAuditTrail(q: Partial<AuditQuery>, signal?: AbortSignal): Promise<AuditPage> {
  return api.get<AuditPage>(withQuery('/api/audit', q), { signal });
}

/** Same filters as the screen, every matching entry as a CSV download (the browser sends the sign-in cookie). */
export const auditTrailCsvUrl = (q: Partial<AuditQuery>) => withQuery('/api/audit/export', { ...q, limit: undefined });

export const auditTrailQueryOptions = (q: Partial<AuditQuery>) =>
  queryOptions({ queryKey: adminKeys.auditTrail(q), queryFn: ({ signal }) => getAuditTrail(q, signal), placeholderData: keepPreviousData });

/** The trail is a record: read when the screen opens or the filters change, never live. */
export function useAuditTrail(q: Partial<AuditQuery>) {
  return useQuery(auditTrailQueryOptions(q));
}
