import { NavLink } from 'react-router-dom';
import type { SessionUser } from '@shared/schemas/auth';
import { usePlant } from '../../features/floor/api/get-plant';
import { navFor } from '../screens';
import { AlarmCounters } from './alarm-counters';
import { ConnectionBadge } from './connection-badge';
import { SiteClock } from './site-clock';
import { UserMenu } from './user-menu';
import { Wordmark } from './wordmark';

export function Header({ user }: { user: SessionUser }) {
  const plant = usePlant();
  const site = plant.data?.sites[0];

  return (
    <header className="flex h-14 shrink-0 items-center gap-4 border-b border-line bg-panel px-3">
      <Wordmark />
      <span className="hidden truncate text-lg font-semibold text-ink-muted 2xl:inline" data-testid="site-name">
        {site?.name ?? ''}
      </span>
      <nav aria-label="Screens" className="flex min-w-0 items-center gap-0.5 overflow-x-auto">
        {navFor(user.role).map((s) => (
          <NavLink
            key={s.path}
            to={s.path}
            end={s.path === '/'}
            className={({ isActive }) =>
              `whitespace-nowrap rounded-md px-2.5 py-1.5 text-sm font-semibold ${isActive ? 'bg-panel-2 text-ink shadow-[inset_0_-3px_0_var(--fs-ink)]' : 'text-ink-muted hover:text-ink'}`
            }
          >
            {s.name}
          </NavLink>
        ))}
      </nav>
      <div className="ml-auto flex shrink-0 items-center gap-3">
        <AlarmCounters />
        <ConnectionBadge />
        {site && <SiteClock siteName={site.name} timeZone={site.timeZone} />}
        <UserMenu user={user} />
      </div>
    </header>
  );
}
