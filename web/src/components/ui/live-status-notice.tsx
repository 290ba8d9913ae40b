import { FALLBACK_POLL_MS, useConnectionState } from '../../lib/socket';

/** Says so on screen when values arrive by polling instead of live push. */
export function LiveStatusNotice({ className = '' }: { className?: string }) {
  const state = useConnectionState();
  if (state === 'connected' || state === 'connecting') return null;
  return (
    <div role="status" className={`rounded-md border-l-4 border-line-strong bg-panel-2 px-3 py-1 text-sm text-ink ${className}`}>
      <span className="font-semibold">Live connection {state === 'offline' ? 'lost' : 'interrupted'}:</span> values refresh every{' '}
      {FALLBACK_POLL_MS / 1000} s until it is back.
    </div>
  );
}
