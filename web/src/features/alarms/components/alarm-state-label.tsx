import type { AlarmState } from '@shared/alarms/states';
import { formatClock } from '../../../lib/format';
import { STATE_LABEL } from './alarm-states';

/** Small clock drawn in currentColor: shelved alarms show it with their expiry. */
function ClockIcon() {
  return (
    <svg viewBox="0 0 16 16" width="14" height="14" aria-hidden="true" className="shrink-0">
      <circle cx="8" cy="8" r="6.5" fill="none" stroke="currentColor" strokeWidth="1.5" />
      <path d="M8 4.5V8l2.5 1.5" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
    </svg>
  );
}

// A shape per state besides the words, so the state survives a monochrome screen.
const MARK: Partial<Record<AlarmState, string>> = { unacknowledged: '●', 'rtn-unacknowledged': '○', acknowledged: '✓' };

/** The lifecycle state in words with a shape; unacknowledged states pulse (not under reduced motion). */
export function AlarmStateLabel({ state, shelvedUntil, timeZone }: { state: AlarmState; shelvedUntil?: string | null; timeZone: string }) {
  const unack = state === 'unacknowledged' || state === 'rtn-unacknowledged';
  const hidden = state === 'out-of-service' || state === 'suppressed';
  return (
    <span
      data-testid="alarm-state"
      data-state={state}
      className={`inline-flex items-center gap-1.5 text-sm ${unack ? 'pulse-attention font-bold' : ''} ${hidden ? 'hatch rounded px-1.5 text-offline-ink' : ''}`}
    >
      {state === 'shelved' ? <ClockIcon /> : MARK[state] && <span aria-hidden="true">{MARK[state]}</span>}
      {STATE_LABEL[state]}
      {state === 'shelved' && shelvedUntil && <span className="text-ink-muted">until {formatClock(Date.parse(shelvedUntil), timeZone).slice(0, 5)}</span>}
    </span>
  );
}
