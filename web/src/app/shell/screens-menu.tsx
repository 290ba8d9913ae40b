import { NavLink } from 'react-router-dom';
import { GROUP_NAMES, type Screen } from '../screens';

const close = () => document.getElementById('screens-menu')?.hidePopover();

/**
 * Every screen of the role in one list, for screens too narrow for the header's nav (phones,
 * tablets, small laptops). A native popover: light dismiss, Escape and focus return come with it.
 */
export function ScreensMenu({ screens }: { screens: Screen[] }) {
  return (
    <>
      <button
        type="button"
        popoverTarget="screens-menu"
        className="flex h-10 w-10 shrink-0 items-center justify-center rounded-md border border-line hover:bg-panel-2 xl:hidden"
        aria-label="Screens menu"
        data-testid="screens-menu-button"
      >
        <svg viewBox="0 0 20 20" width="20" height="20" aria-hidden="true">
          <path d="M3 5h14M3 10h14M3 15h14" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
        </svg>
      </button>
      <div id="screens-menu" popover="auto" className="fixed inset-auto top-14 left-2 m-0 max-h-[calc(100dvh-4rem)] w-64 max-w-[calc(100vw-1rem)] overflow-auto rounded-lg border border-line bg-panel p-1 text-ink shadow-xl">
        <nav aria-label="Screens">
          <ul className="flex flex-col">
            {screens.map((s) => (
              <li key={s.path}>
                <NavLink
                  to={s.path}
                  end={s.path === '/'}
                  onClick={close}
                  className={({ isActive }) => `block rounded px-3 py-2.5 font-semibold ${isActive ? 'bg-panel-2 text-ink shadow-[inset_3px_0_0_var(--fs-ink)]' : 'text-ink-muted hover:bg-panel-2 hover:text-ink'}`}
                >
                  {s.name}
                  {s.group && <span className="ml-2 text-xs font-normal text-ink-muted">{GROUP_NAMES[s.group]}</span>}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </div>
    </>
  );
}
