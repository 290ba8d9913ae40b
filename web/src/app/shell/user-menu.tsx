import { Link } from 'react-router-dom';
import type { SessionUser } from '@shared/schemas/auth';
import { useSignOut } from '../../features/auth/api/sign-out';
import { setTheme, useTheme, type Theme } from '../../lib/theme';
import { endSession } from '../session';

const THEMES: Array<{ value: Theme; label: string; hint: string }> = [
  { value: 'wall', label: 'Wall', hint: 'dark, for control-room screens' },
  { value: 'desk', label: 'Desk', hint: 'light, for offices' },
];

/** Uses the native popover: light dismiss, Escape and focus return come with it. */
export function UserMenu({ user }: { user: SessionUser }) {
  const theme = useTheme();
  const signOut = useSignOut();
  const close = () => document.getElementById('user-menu')?.hidePopover();

  return (
    <>
      <button
        type="button"
        popoverTarget="user-menu"
        className="flex h-10 items-center gap-2 rounded-md border border-line px-2.5 text-left hover:bg-panel-2 md:px-3"
        data-testid="user-menu-button"
      >
        <span aria-hidden="true" className="font-bold md:hidden">
          {user.name.split(/\s+/).map((w) => w[0]).join('').slice(0, 2)}
        </span>
        <span className="sr-only md:not-sr-only md:flex md:flex-col md:leading-tight">
          <span className="max-w-[11rem] truncate text-sm font-semibold">{user.name}</span>
          <span className="text-xs capitalize text-ink-muted">{user.role}</span>
        </span>
        <span aria-hidden="true" className="hidden text-ink-muted md:inline">
          ▾
        </span>
      </button>
      <div
        id="user-menu"
        popover="auto"
        className="fixed inset-auto top-14 right-2 m-0 w-72 max-w-[calc(100vw-1rem)] rounded-lg border border-line bg-panel p-3 text-ink shadow-xl"
      >
        <div className="mb-3 border-b border-line pb-2 text-sm">
          <div className="font-semibold">{user.name}</div>
          <div className="text-ink-muted">{user.email}</div>
        </div>
        <fieldset className="mb-3">
          <legend className="mb-1 text-sm font-semibold">Theme</legend>
          {THEMES.map((t) => (
            <label key={t.value} className="flex cursor-pointer items-center gap-2 rounded px-1 py-1 text-sm hover:bg-panel-2">
              <input type="radio" name="theme" value={t.value} checked={theme === t.value} onChange={() => setTheme(t.value)} />
              <span className="font-semibold">{t.label}</span>
              <span className="text-ink-muted">{t.hint}</span>
            </label>
          ))}
        </fieldset>
        <div className="flex flex-col gap-1 border-t border-line pt-2">
          <Link to="/account/password" onClick={close} className="rounded px-1 py-1.5 text-sm hover:bg-panel-2">
            Change password
          </Link>
          <button
            type="button"
            className="rounded px-1 py-1.5 text-left text-sm hover:bg-panel-2"
            disabled={signOut.isPending}
            onClick={() => signOut.mutate(undefined, { onSettled: () => void endSession('signed-out') })}
          >
            {signOut.isPending ? 'Signing out…' : 'Sign out'}
          </button>
        </div>
      </div>
    </>
  );
}
