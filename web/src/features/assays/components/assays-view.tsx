import { useState } from 'react';
import type { Role, SessionUser } from '@shared/schemas/auth';
import { SelectField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/panel';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useAssays } from '../api/get-assays';
import { AssayForm } from './assay-form';
import { AssayTable } from './assay-table';
import { CsvUpload } from './csv-upload';
import { tankOptions, type TankOption } from './tank-option';

const WRITERS: readonly Role[] = ['metallurgist', 'admin'];

/** Assays: lab results by hand or from a lab file, each compared with what the probe read. */
export function AssaysView({ user, tanks, timeZone }: { user: SessionUser; tanks: TankOption[]; timeZone: string }) {
  const [tankId, setTankId] = useState<number | undefined>(undefined);
  const [showRetracted, setShowRetracted] = useState(false);
  const assays = useAssays({ tankId, includeRetracted: showRetracted ? 'true' : 'false', limit: 200 });
  const canWrite = WRITERS.includes(user.role);

  return (
    <div className="mx-auto flex max-w-[100rem] flex-col gap-4">
      <h1 className="text-2xl font-bold">Assays</h1>
      {canWrite && (
        <div className="grid gap-4 xl:grid-cols-2">
          <Panel title="Enter an assay">
            <AssayForm tanks={tanks} timeZone={timeZone} defaultTankId={tankId} />
          </Panel>
          <Panel title="Upload a lab file">
            <CsvUpload />
          </Panel>
        </div>
      )}
      <Panel
        title="Stored assays"
        actions={
          <div className="flex items-end gap-4">
            <label className="inline-flex items-center gap-2 text-sm">
              <input type="checkbox" checked={showRetracted} onChange={(e) => setShowRetracted(e.target.checked)} className="h-4 w-4" />
              Show retracted
            </label>
            <div className="w-56">
              <SelectField
                label="Tank"
                value={tankId === undefined ? '' : String(tankId)}
                onChange={(e) => setTankId(e.target.value ? Number(e.target.value) : undefined)}
                options={[{ value: '', label: 'All tanks' }, ...tankOptions(tanks)]}
              />
            </div>
          </div>
        }
      >
        {assays.isPending ? (
          <Loading label="Loading assays…" />
        ) : assays.isError ? (
          <ErrorState title="Assays could not be loaded" detail={assays.error.message} onRetry={() => assays.refetch()} />
        ) : assays.data.assays.length === 0 ? (
          <p className="text-ink-muted">No assays stored{tankId ? ' for this tank' : ''} yet.</p>
        ) : (
          <AssayTable assays={assays.data.assays} timeZone={timeZone} canRetract={canWrite} windowMin={assays.data.windowMin} />
        )}
      </Panel>
    </div>
  );
}
