import { NavLink } from 'react-router-dom';
import type { SessionUser } from '@shared/schemas/auth';
import { usePlant } from '../../features/floor/api/get-plant';
import { GROUP_NAMES, navFor, type Screen } from '../screens';
import { AlarmCounters } from './alarm-counters';
import { ConnectionBadge } from './connection-badge';
import { NavMenu, navItemClass } from './nav-menu';
import { ScreensMenu } from './screens-menu';
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

function ScreensNav({ user, className }: { user: SessionUser; className: string }) {
  return (
    <nav aria-label="Screens" className={`min-w-0 items-center gap-0.5 ${className}`}>
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
  );
}

/**
 * Wide screens (from 1800 px) keep everything on one line; from 1280 px the nav gets a line of
 * its own, so no entry is ever cut off; below that every screen is in the menu button.
 */
export function Header({ user }: { user: SessionUser }) {
  const plant = usePlant();
  const site = plant.data?.sites[0];

  return (
    <header className="shrink-0 border-b border-line bg-panel" data-testid="app-header">
      <div className="flex h-14 items-center gap-2 px-2 sm:gap-4 sm:px-3">
        <ScreensMenu screens={navFor(user.role)} />
        <Wordmark compact />
        <span className="hidden truncate text-lg font-semibold text-ink-muted min-[1800px]:inline" data-testid="site-name">
          {site?.name ?? ''}
        </span>
        <ScreensNav user={user} className="hidden min-[1800px]:flex" />
        <div className="ml-auto flex min-w-0 shrink-0 items-center gap-1.5 sm:gap-3">
          <AlarmCounters />
          <ConnectionBadge />
          {site && <SiteClock siteName={site.name} timeZone={site.timeZone} />}
          <UserMenu user={user} />
        </div>
      </div>
      <ScreensNav user={user} className="hidden flex-wrap px-2 pb-1.5 min-[1280px]:max-[1799px]:flex" />
    </header>
  );
}
