import type { ReactNode } from 'react';
import { canApply } from '@shared/alarms/states';
import type { AlarmView, DefinitionView } from '@shared/schemas/alarms';
import { Button } from '../../../components/ui/button';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { AlarmStateLabel } from './alarm-state-label';
import { deadbandText, secondsText, tripText } from './definition-text';

export type RowAction = 'edit' | 'oos' | 'rts';

type Props = {
  definition: DefinitionView;
  /** The definition's open alarm, if any (an out-of-service definition always has one). */
  alarm: AlarmView | undefined;
  timeZone: string;
  canEdit: boolean;
  open: boolean;
  onAction: (action: RowAction) => void;
  /** The form under the row while one is open. */
  children?: ReactNode;
};

const COLUMNS = 9;

/** One definition: its settings on one line, its rationalisation under it, then any open form. */
export function DefinitionRow({ definition: d, alarm, timeZone, canEdit, open, onAction, children }: Props) {
  const status = alarm ? { state: alarm.state, conditionActive: alarm.conditionActive } : { state: 'normal' as const, conditionActive: false };
  const r = d.rationalisation;
  return (
    <tbody data-testid="definition" data-kind={d.kind} data-definition-id={d.id} className={`border-b border-line ${open ? 'bg-panel-2' : ''}`}>
      <tr>
        <td className="pt-2 pr-2 align-top"><PriorityPill priority={d.priority as 1 | 2 | 3} /></td>
        <td className="pt-2 pr-3 align-top font-semibold">{d.label}</td>
        <td className="pt-2 pr-3 align-top tabular-nums" data-testid="definition-limit">{tripText(d)}</td>
        <td className="pt-2 pr-3 text-right align-top tabular-nums">{deadbandText(d)}</td>
        <td className="pt-2 pr-3 text-right align-top tabular-nums">{secondsText(d.onDelayS)}</td>
        <td className="pt-2 pr-3 text-right align-top tabular-nums">{secondsText(d.offDelayS)}</td>
        <td className="pt-2 pr-3 text-right align-top tabular-nums">{secondsText(d.windowS)}</td>
        <td className="pt-2 pr-3 align-top">
          {alarm ? <AlarmStateLabel state={alarm.state} shelvedUntil={alarm.shelvedUntil} timeZone={timeZone} /> : <span className="text-sm text-ink-muted">In service</span>}
          {alarm?.oosReason && <p className="mt-0.5 max-w-56 text-xs text-ink-muted">{alarm.oosReason}</p>}
        </td>
        <td className="w-px pt-1.5 align-top">
          {canEdit && !open && (
            <div className="flex justify-end gap-1 whitespace-nowrap">
              <Button size="sm" onClick={() => onAction('edit')} aria-label={`Change ${d.label}`}>Change…</Button>
              {canApply(status, 'remove-from-service') && <Button size="sm" variant="ghost" onClick={() => onAction('oos')}>Take out of service…</Button>}
              {canApply(status, 'return-to-service') && <Button size="sm" variant="ghost" onClick={() => onAction('rts')}>Return to service…</Button>}
            </div>
          )}
        </td>
      </tr>
      <tr>
        <td />
        <td colSpan={COLUMNS - 1} className="pb-2.5 pt-1 text-xs leading-snug text-ink-muted">
          <span className="font-semibold text-ink">Respond within {r.responseMin} min.</span> <span className="text-ink">{r.action}</span>
          <span className="mx-1.5" aria-hidden="true">·</span>Cause: {r.cause}
          <span className="mx-1.5" aria-hidden="true">·</span>If nobody acts: {r.consequence}
        </td>
      </tr>
      {children && (
        <tr>
          <td colSpan={COLUMNS} className="px-3 pb-4 pt-2">{children}</td>
        </tr>
      )}
    </tbody>
  );
}
