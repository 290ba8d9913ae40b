import { setAlarmSoundMuted, useAlarmSoundMuted } from '../hooks/use-alarm-sound';

/** Mutes the P1 tone for this browser; the choice is remembered. */
export function SoundToggle() {
  const muted = useAlarmSoundMuted();
  return (
    <button
      type="button"
      onClick={() => setAlarmSoundMuted(!muted)}
      aria-pressed={!muted}
      aria-label="Alarm sound"
      className="inline-flex h-7 items-center gap-1 whitespace-nowrap rounded-md border border-line-strong px-2 text-xs font-semibold text-ink-muted hover:text-ink"
      title={muted ? 'Alarm sound is off: click to turn it on' : 'Alarm sound is on: click to mute'}
    >
      <svg viewBox="0 0 16 16" width="14" height="14" aria-hidden="true">
        <path d="M2 6h3l4-3v10L5 10H2z" fill="currentColor" />
        {muted ? <path d="M11 5.5l4 5M15 5.5l-4 5" stroke="currentColor" strokeWidth="1.5" /> : <path d="M11.5 5a4 4 0 010 6" fill="none" stroke="currentColor" strokeWidth="1.5" />}
      </svg>
      <span className="hidden 2xl:inline">{muted ? 'Sound off' : 'Sound on'}</span>
    </button>
  );
}
