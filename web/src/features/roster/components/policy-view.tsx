import { useState } from 'react';
import { PRIORITIES, PRIORITY_LABEL, type Priority } from '@shared/alarms/kinds';
import { ON_CALL_LABEL, type EscalationStepView } from '@shared/schemas/roster';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { Panel } from '../../../components/ui/panel';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { usePolicy } from '../api/get-policy';
import { PolicyForm } from './policy-form';

/** 'P1 high' → 'High': the pill beside it already says P1. */
const levelOf = (p: Priority) => PRIORITY_LABEL[p].replace(/^P\d (.)/, (_, c: string) => c.toUpperCase());

const stepsText = (steps: EscalationStepView[]) =>
  steps.map((s) => `after ${s.afterMin} min → ${s.notify.map((r) => ON_CALL_LABEL[r]).join(' and ')}`).join('; then ');

/**
 * Escalation steps per priority: after how long unacknowledged, who gets an e-mail. Steps stop
 * at acknowledgement. Supervisors and admins change one priority at a time.
 */
export function PolicyView({ canManage = false }: { canManage?: boolean }) {
  const q = usePolicy();
  const [editing, setEditing] = useState<Priority | null>(null);
  const [saved, setSaved] = useState<Priority | null>(null);
  const steps = q.data ?? [];
  const done = (p: Priority) => (ok: boolean) => {
    setEditing(null);
    setSaved(ok ? p : null);
  };
  return (
    <Panel title="Call-out steps">
      {q.isError && <p role="alert" className="mb-2 text-sm text-attention-1-ink">The call-out steps could not be loaded: {q.error.message}</p>}
      <ul className="flex flex-col gap-3 text-sm" data-testid="policy">
        {PRIORITIES.map((p) => {
          const mine = steps.filter((s) => s.priority === p);
          return (
            <li key={p} className="flex flex-col gap-2" data-testid={`policy-${p}`}>
              <div className="flex items-start gap-2">
                <PriorityPill priority={p} />
                <p className="min-w-0 flex-1">
                  <span className="font-semibold">{levelOf(p)}:</span>{' '}
                  {mine.length === 0 ? <span className="text-ink-muted">no e-mail</span> : stepsText(mine)}
                </p>
                {canManage && editing === null && q.data && (
                  <Button size="sm" onClick={() => (setSaved(null), setEditing(p))} aria-label={`Change call-out steps for ${PRIORITY_LABEL[p]}`}>Change…</Button>
                )}
              </div>
              {saved === p && <Notice tone="info">Saved. The reason is in the change record.</Notice>}
              {editing === p && (
                <div className="rounded-md border border-line bg-panel-2 p-3"><PolicyForm priority={p} steps={steps} onDone={done(p)} /></div>
              )}
            </li>
          );
        })}
      </ul>
      <p className="mt-3 text-sm text-ink-muted">Call-out e-mail stops once the alarm is acknowledged, on screen or from the link in the mail. Each person gets a mail of their own.</p>
    </Panel>
  );
}
