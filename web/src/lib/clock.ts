import { useSyncExternalStore } from 'react';

/**
 * Reading ages are measured on the server's clock: a browser clock a few minutes off
 * would otherwise make every value look stale (or fresh) on that one screen.
 */
let offsetMs = 0;

export function setServerTime(serverIso: string): void {
  const server = Date.parse(serverIso);
  if (Number.isFinite(server)) offsetMs = server - Date.now();
}

export function serverNow(): number {
  return Date.now() + offsetMs;
}

// One shared 1 s ticker for every clock, age and freshness on screen.
const listeners = new Set<() => void>();
let timer: ReturnType<typeof setInterval> | undefined;
let tick = serverNow();

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  if (!timer) {
    timer = setInterval(() => {
      tick = serverNow();
      for (const l of listeners) l();
    }, 1000);
  }
  return () => {
    listeners.delete(listener);
    if (listeners.size === 0 && timer) {
      clearInterval(timer);
      timer = undefined;
    }
  };
}

/** Server-corrected "now" in ms, updated every second. */
export function useNow(): number {
  return useSyncExternalStore(subscribe, () => tick);
}
