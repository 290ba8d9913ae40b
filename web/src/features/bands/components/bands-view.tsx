import { useState } from 'react';
import type { Role, SessionUser } from '@shared/schemas/auth';
import type { BandRow } from '@shared/schemas/bands';
import { CautionNote } from '../../../components/ui/caution-note';
import { Panel } from '../../../components/ui/panel';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useBands } from '../api/get-bands';
import { BandChangeForm } from './band-change-form';
import { BandChangesPanel } from './band-changes-panel';
import { BandCopyForm } from './band-copy-form';
import { BandTable } from './band-table';

const CHANGERS: readonly Role[] = ['metallurgist', 'admin'];
type Editing = { mode: 'change' | 'copy' | 'history'; row: BandRow } | null;

/** Bands: ratio setpoints per tank, shown also in mV, with change control and the change record. */
export function BandsView({ user, timeZone, onBandChanged }: { user: SessionUser; timeZone: string; onBandChanged?: () => void }) {
  const bands = useBands();
  const [editing, setEditing] = useState<Editing>(null);
  if (bands.isPending) return <Loading label="Loading bands…" />;
  if (bands.isError) return <ErrorState title="Bands could not be loaded" detail={bands.error.message} onRetry={() => bands.refetch()} />;

  const circuits = [...new Map(bands.data.tanks.map((t) => [t.circuitId, t.circuitName])).entries()];
  const canChange = CHANGERS.includes(user.role);
  const close = () => setEditing(null);
  const factorOf = (row: BandRow) => bands.data.approvalFactor[row.siteId] ?? 2;

  return (
    <div className="mx-auto flex max-w-7xl flex-col gap-4">
      <div>
        <h1 className="text-2xl font-bold">Bands</h1>
        <p className="text-sm text-ink-muted">
          Every change needs a reason and is kept in the record. A bound moved by more than the site's factor waits for a second person.
        </p>
      </div>
      <BandChangesPanel title="Awaiting approval" filter={{ status: 'pending' }} user={user} timeZone={timeZone} empty="No band change is waiting." onChanged={onBandChanged} />
      {circuits.map(([id, name]) => {
        const rows = bands.data.tanks.filter((t) => t.circuitId === id);
        const here = editing && editing.row.circuitId === id ? editing : null;
        return (
          <Panel key={id} title={name}>
            <BandTable
              rows={rows}
              selected={here?.row.tankId ?? null}
              canChange={canChange}
              onChange={(row) => setEditing({ mode: 'change', row })}
              onCopy={(row) => setEditing({ mode: 'copy', row })}
              onHistory={(row) => setEditing({ mode: 'history', row })}
            />
            {here && here.mode !== 'history' && (
              <div className="mt-4 rounded-md border border-line bg-panel-2 p-4">
                {here.mode === 'change' ? (
                  <BandChangeForm key={here.row.tankId} row={here.row} approvalFactor={factorOf(here.row)} onDone={close} onChanged={onBandChanged} />
                ) : (
                  <BandCopyForm key={here.row.tankId} from={here.row} circuitTanks={rows} onDone={close} onChanged={onBandChanged} />
                )}
              </div>
            )}
            {here?.mode === 'history' && (
              <div className="mt-4">
                <BandChangesPanel title={`Change record of ${here.row.tankTag}`} filter={{ tankId: here.row.tankId }} user={user} timeZone={timeZone} empty="No change recorded yet." />
              </div>
            )}
          </Panel>
        );
      })}
      <BandChangesPanel title="Recent changes, all tanks" filter={{ limit: 8 }} user={user} timeZone={timeZone} empty="No band change recorded yet." onChanged={onBandChanged} />
      <CautionNote />
    </div>
  );
}
