import { NavLink } from 'react-router-dom';
import type { SessionUser } from '@shared/schemas/auth';
import { usePlant } from '../../features/floor/api/get-plant';
import { GROUP_NAMES, navFor, type Screen } from '../screens';
import { AlarmCounters } from './alarm-counters';
import { ConnectionBadge } from './connection-badge';
import { NavMenu, navItemClass } from './nav-menu';
import { SiteClock } from './site-clock';
import { UserMenu } from './user-menu';
import { Wordmark } from './wordmark';

type NavEntry = Screen | { group: NonNullable<Screen['group']>; screens: Screen[] };

/** A group with more than one screen the role may open becomes one menu, placed where its first screen was. */
function navEntries(user: SessionUser): NavEntry[] {
  const screens = navFor(user.role);
  const out: NavEntry[] = [];
  for (const s of screens) {
    const members = s.group ? screens.filter((x) => x.group === s.group) : [];
    if (!s.group || members.length < 2) out.push(s);
    else if (members[0] === s) out.push({ group: s.group, screens: members });
  }
  return out;
}

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
        {navEntries(user).map((e) =>
          'screens' in e ? (
            <NavMenu key={e.group} id={`nav-${e.group}`} label={GROUP_NAMES[e.group]} screens={e.screens} />
          ) : (
            <NavLink key={e.path} to={e.path} end={e.path === '/'} className={({ isActive }) => navItemClass(isActive)}>
              {e.name}
            </NavLink>
          ),
        )}
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
