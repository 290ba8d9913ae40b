import { useSyncExternalStore } from 'react';

/**
 * The audible part of a new P1 alarm: a short falling two-tone made with WebAudio (no sound
 * files), muted per browser and remembered. Browsers keep audio locked until the user has
 * interacted with the page, so the first click anywhere unlocks it.
 */
const KEY = 'ferrisight.alarm-sound';
const listeners = new Set<() => void>();
let muted = read();
let ctx: AudioContext | null = null;

function read(): boolean {
  try {
    return localStorage.getItem(KEY) === 'off';
  } catch {
    return false;
  }
}

function audio(): AudioContext | null {
  if (typeof window === 'undefined' || !('AudioContext' in window)) return null;
  ctx ??= new AudioContext();
  return ctx;
}

if (typeof window !== 'undefined') {
  window.addEventListener('pointerdown', () => void audio()?.resume().catch(() => undefined), { once: true });
}

export function setAlarmSoundMuted(next: boolean): void {
  muted = next;
  try {
    localStorage.setItem(KEY, next ? 'off' : 'on');
  } catch {
    // Not remembered in private mode: lasts for this page.
  }
  if (!next) void audio()?.resume().catch(() => undefined);
  for (const l of listeners) l();
}

export function useAlarmSoundMuted(): boolean {
  return useSyncExternalStore((l) => (listeners.add(l), () => listeners.delete(l)), () => muted);
}

/** Plays the P1 tone unless muted; silently does nothing when audio is locked or absent. */
export function playAlarmTone(): void {
  const a = audio();
  if (muted || !a || a.state !== 'running') return;
  const t0 = a.currentTime;
  for (const [i, hz] of [988, 740, 988, 740].entries()) {
    const osc = a.createOscillator();
    const gain = a.createGain();
    osc.type = 'triangle';
    osc.frequency.value = hz;
    const start = t0 + i * 0.22;
    gain.gain.setValueAtTime(0.0001, start);
    gain.gain.exponentialRampToValueAtTime(0.25, start + 0.02);
    gain.gain.exponentialRampToValueAtTime(0.0001, start + 0.18);
    osc.connect(gain).connect(a.destination);
    osc.start(start);
    osc.stop(start + 0.2);
  }
}
