import type { AuditQuery } from '@shared/schemas/audit';

export const adminKeys = {
  all: ['admin'] as const,
  users: () => [...adminKeys.all, 'users'] as const,
  simulator: () => [...adminKeys.all, 'simulator'] as const,
  ingestHealth: () => [...adminKeys.all, 'ingest-health'] as const,
  siteSettings: () => [...adminKeys.all, 'site-settings'] as const,
  auditTrail: (q: Partial<AuditQuery>) => [...adminKeys.all, 'audit-trail', q] as const,
};
