import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { DigestResponse, DigestTableName } from '@shared/schemas/digest';
import { api, withQuery } from '../../../lib/api-client';
import { digestKeys } from './digest-keys';

/** A shift by its start, a range, or neither (the last closed shift). */
export type DigestParams = { shiftStart?: string; from?: string; to?: string };

export function getDigest(p: DigestParams, signal?: AbortSignal): Promise<DigestResponse> {
  return api.get<DigestResponse>(withQuery('/api/digest', p), { signal });
}

/**
 * One table of the digest on screen as a CSV download, written by the server's one CSV writer.
 * A shift is pinned by its start, so "the last closed shift" cannot move between view and download.
 */
export function digestCsvUrl(d: Pick<DigestResponse, 'site' | 'shift'>, p: DigestParams, table: DigestTableName): string {
  const period = d.shift ? { shiftStart: d.shift.startsAt } : { from: p.from, to: p.to };
  return withQuery('/api/digest/export', { siteId: d.site.id, ...period, table });
}

export const digestQueryOptions = (p: DigestParams) =>
  queryOptions({ queryKey: digestKeys.digest(p), queryFn: ({ signal }) => getDigest(p, signal), staleTime: 60_000 });

/** The digest is a record of the past: no live updates, refreshed on demand. */
export function useDigest(p: DigestParams) {
  return useQuery({ ...digestQueryOptions(p), placeholderData: keepPreviousData });
}
