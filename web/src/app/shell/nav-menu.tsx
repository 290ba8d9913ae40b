import { useState } from 'react';
import { NavLink, useLocation } from 'react-router-dom';
import type { Screen } from '../screens';

export function navItemClass(active: boolean): string {
  return `whitespace-nowrap rounded-md px-2.5 py-1.5 text-sm font-semibold ${active ? 'bg-panel-2 text-ink shadow-[inset_0_-3px_0_var(--fs-ink)]' : 'text-ink-muted hover:text-ink'}`;
}

/**
 * Several screens under one header entry, so the nav stays on one line at 1366 px for every
 * role. A native popover: light dismiss, Escape and focus return come with it.
 */
export function NavMenu({ id, label, screens }: { id: string; label: string; screens: Screen[] }) {
  const { pathname } = useLocation();
  const [left, setLeft] = useState(0);
  const current = screens.find((s) => pathname === s.path || pathname.startsWith(`${s.path}/`));
  const close = () => document.getElementById(id)?.hidePopover();

  return (
    <>
      <button
        type="button"
        popoverTarget={id}
        onClick={(e) => setLeft(e.currentTarget.getBoundingClientRect().left)}
        className={`flex items-center gap-1 ${navItemClass(!!current)}`}
        title={current ? `${label}: ${current.name}` : undefined}
        data-testid={`nav-menu-${id}`}
      >
        {label}
        <span aria-hidden="true" className="text-xs">
          ▾
        </span>
      </button>
      <div id={id} popover="auto" style={{ left }} className="fixed inset-auto top-14 m-0 min-w-48 rounded-lg border border-line bg-panel p-1 text-ink shadow-xl">
        <ul aria-label={label} className="flex flex-col">
          {screens.map((s) => (
            <li key={s.path}>
              <NavLink
                to={s.path}
                onClick={close}
                className={({ isActive }) => `block rounded px-3 py-2 text-sm font-semibold ${isActive ? 'bg-panel-2 text-ink' : 'text-ink-muted hover:bg-panel-2 hover:text-ink'}`}
              >
                {s.name}
              </NavLink>
            </li>
          ))}
        </ul>
      </div>
    </>
  );
}
