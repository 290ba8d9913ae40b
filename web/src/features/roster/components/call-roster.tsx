import { useMemo } from 'react';
import type { Role } from '@shared/schemas/auth';
import { Panel } from '../../../components/ui/panel';
import { useNow } from '../../../lib/clock';
import { useOnCallShifts } from '../api/get-on-call-shifts';
import { OnCallNow } from './on-call-now';
import { PolicyView } from './policy-view';
import { ShiftForm } from './shift-form';
import { ShiftTable } from './shift-table';

const MANAGERS: readonly Role[] = ['supervisor', 'admin'];
const DAY = 86_400_000;

/** Call roster: who is rostered this hour, the next two weeks of shifts, and the call-out steps. */
export function CallRoster({ role, timeZone }: { role: Role; timeZone: string }) {
  const now = useNow();
  const hour = Math.floor(now / 3_600_000) * 3_600_000;
  const range = useMemo(() => ({ from: new Date(hour - DAY).toISOString(), to: new Date(hour + 14 * DAY).toISOString() }), [hour]);
  const shifts = useOnCallShifts(range.from, range.to);
  const canManage = MANAGERS.includes(role);
  return (
    <div className="mx-auto flex max-w-7xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Call roster</h1>
      <Panel><OnCallNow /></Panel>
      <div className="grid gap-4 lg:grid-cols-[2fr_1fr]">
        <Panel title="Shifts, yesterday to two weeks ahead">
          {shifts.data ? <ShiftTable shifts={shifts.data} timeZone={timeZone} canManage={canManage} now={now} /> : <p className="text-ink-muted">{shifts.isError ? shifts.error.message : 'Loading…'}</p>}
        </Panel>
        <div className="flex flex-col gap-4">
          <PolicyView canManage={canManage} />
          {canManage && <Panel title="Add a shift"><ShiftForm timeZone={timeZone} /></Panel>}
        </div>
      </div>
    </div>
  );
}
