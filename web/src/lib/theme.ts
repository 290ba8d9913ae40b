import { useSyncExternalStore } from 'react';

/** wall: dark slate for control-room wall screens; desk: light for desks. */
export type Theme = 'wall' | 'desk';

const KEY = 'ferrisight.theme';
const listeners = new Set<() => void>();

function stored(): Theme {
  try {
    return localStorage.getItem(KEY) === 'desk' ? 'desk' : 'wall';
  } catch {
    return 'wall';
  }
}

let current: Theme = stored();

/** Applies the remembered theme before the first render (no inline script: the CSP forbids it). */
export function applyStoredTheme(): void {
  document.documentElement.dataset.theme = current;
}

export function setTheme(theme: Theme): void {
  current = theme;
  document.documentElement.dataset.theme = theme;
  try {
    localStorage.setItem(KEY, theme);
  } catch {
    // Private mode or a full store: the choice lasts for this page only.
  }
  for (const l of listeners) l();
}

export function useTheme(): Theme {
  return useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => current,
  );
}
