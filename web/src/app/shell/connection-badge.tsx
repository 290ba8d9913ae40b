import { FALLBACK_POLL_MS, useConnectionState, type ConnectionState } from '../../lib/socket';

const TEXT: Record<ConnectionState, string> = {
  connecting: 'Connecting…',
  connected: 'Live',
  reconnecting: 'Reconnecting…',
  offline: 'Offline',
};

// Shapes carry the state as well as the words: solid dot, open ring, struck square.
function Glyph({ state }: { state: ConnectionState }) {
  if (state === 'connected') return <circle cx="7" cy="7" r="5" fill="currentColor" />;
  if (state === 'offline')
    return (
      <g fill="none" stroke="currentColor" strokeWidth="1.75">
        <rect x="2" y="2" width="10" height="10" />
        <line x1="2" y1="12" x2="12" y2="2" />
      </g>
    );
  return <circle cx="7" cy="7" r="4.5" fill="none" stroke="currentColor" strokeWidth="1.75" strokeDasharray="3 2" />;
}

export function ConnectionBadge() {
  const state = useConnectionState();
  const polling = state !== 'connected' && state !== 'connecting';
  return (
    <div
      role="status"
      data-testid="connection-state"
      data-state={state}
      className={`flex items-center gap-1.5 rounded-md px-2 py-1 text-sm ${state === 'offline' ? 'hatch border border-dashed border-line-strong' : ''}`}
      title={polling ? `Live push is down; values refresh every ${FALLBACK_POLL_MS / 1000} s` : undefined}
    >
      <svg viewBox="0 0 14 14" className={`h-3.5 w-3.5 ${state === 'reconnecting' || state === 'connecting' ? 'pulse-attention' : ''}`} aria-hidden="true">
        <Glyph state={state} />
      </svg>
      <span className="sr-only font-semibold sm:not-sr-only">{TEXT[state]}</span>
      {polling && <span className="hidden text-ink-muted xl:inline">· polling {FALLBACK_POLL_MS / 1000} s</span>}
    </div>
  );
}
