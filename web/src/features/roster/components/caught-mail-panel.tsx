import { useState } from 'react';
import { Panel } from '../../../components/ui/panel';
import { formatDateTime } from '../../../lib/format';
import { useCaughtMail } from '../api/get-caught-mail';

/** Admin: what the local SMTP catcher received (escalation mail in the demo), newest first; plain-text part shown. */
export function CaughtMailPanel({ timeZone }: { timeZone: string }) {
  const q = useCaughtMail();
  const [open, setOpen] = useState<string | null>(null);
  const mail = q.data ?? [];
  return (
    <Panel title="Caught mail">
      <p className="mb-2 text-sm text-ink-muted">Messages received by the local mail catcher (nothing is delivered outside). With SMTP_URL set to a real relay this stays empty.</p>
      {q.isError ? <p className="text-sm text-attention-1-ink">{q.error.message}</p> : mail.length === 0 ? <p className="text-sm text-ink-muted">No mail caught yet.</p> : (
        <ul className="flex flex-col divide-y divide-line" data-testid="caught-mail">
          {mail.map((m) => (
            <li key={m.id} className="py-2">
              <button type="button" className="flex w-full flex-wrap items-baseline gap-x-3 text-left" aria-expanded={open === m.id} onClick={() => setOpen(open === m.id ? null : m.id)}>
                <span className="tabular-nums text-sm text-ink-muted">{formatDateTime(m.receivedAt, timeZone)}</span>
                <span className="font-semibold">{m.subject}</span>
                <span className="text-sm text-ink-muted">to {m.envelope.to.join(', ')}</span>
              </button>
              {open === m.id && <pre className="mt-2 max-h-96 overflow-auto whitespace-pre-wrap rounded bg-panel-2 p-3 text-xs">{m.text}</pre>}
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}
