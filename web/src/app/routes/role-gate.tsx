import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { Role } from '@shared/schemas/auth';
import { ErrorState } from '../../components/ui/page-state';
import { hasRole, useSessionUser } from '../../features/auth/hooks/use-session-user';

/** Client-side courtesy only: the server refuses the data anyway. */
export function RoleGate({ roles, children }: { roles: readonly Role[]; children: ReactNode }) {
  const user = useSessionUser();
  if (hasRole(user, roles)) return children;
  return (
    <ErrorState title="Not available for your role" detail={`This screen is for: ${roles.join(', ')}.`}>
      <Link to="/" className="mt-3 inline-block text-info-ink underline">
        Back to the Floor
      </Link>
    </ErrorState>
  );
}
