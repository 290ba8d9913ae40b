import { ROLES, type Role } from '@shared/schemas/auth';

export const ROLE_LABELS: Record<Role, string> = {
  operator: 'Operator',
  supervisor: 'Supervisor',
  metallurgist: 'Metallurgist',
  engineer: 'Engineer',
  admin: 'Administrator',
};

export const ROLE_OPTIONS = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));
