import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

/** One message the local SMTP catcher received (GET /api/admin/mail, admin only). */
export type CaughtMail = {
  id: string; receivedAt: string; envelope: { from: string | null; to: string[] }; messageId: string | null;
  from: string; to: string; subject: string; text: string; html: string | null;
};

export const getCaughtMail = (signal?: AbortSignal) => api.get<{ mail: CaughtMail[] }>('/api/admin/mail?limit=50', { signal }).then((r) => r.mail);

export const caughtMailQueryOptions = () => queryOptions({ queryKey: rosterKeys.mail(), queryFn: ({ signal }) => getCaughtMail(signal), refetchInterval: 15_000 });

export function useCaughtMail() {
  return useQuery(caughtMailQueryOptions());
}
