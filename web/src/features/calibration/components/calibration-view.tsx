import { useState } from 'react';
import type { Role, SessionUser } from '@shared/schemas/auth';
import { SelectField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/panel';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useCalibration } from '../api/get-calibration';
import { useCheckSchedule } from '../api/get-check-schedule';
import { CheckScheduleTable } from './check-schedule-table';
import { FitPanel } from './fit-panel';
import { ProbeChecksPanel } from './probe-checks-panel';
import { VersionsTable } from './versions-table';

export type CalibrationTank = { id: number; tag: string; name: string };
const WRITERS: readonly Role[] = ['metallurgist', 'admin'];

function TankCalibration({ tankId, user, timeZone, onCalibrationChanged }: { tankId: number; user: SessionUser; timeZone: string; onCalibrationChanged?: () => void }) {
  const overview = useCalibration(tankId);
  const canWrite = WRITERS.includes(user.role);
  if (overview.isPending) return <Loading label="Loading calibration…" />;
  if (overview.isError) return <ErrorState title="Calibration could not be loaded" detail={overview.error.message} onRetry={() => overview.refetch()} />;
  const o = overview.data;
  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <Panel title={`Fit E°′ for ${o.tankTag} from assays`}>
        {o.probe ? (
          <FitPanel key={tankId} tankId={tankId} timeZone={timeZone} canApply={canWrite} onCalibrationChanged={onCalibrationChanged} />
        ) : (
          <p className="text-ink-muted">This tank has no probe.</p>
        )}
      </Panel>
      <div className="flex flex-col gap-4">
        <Panel title="Versions">
          {o.probe && (
            <p className="mb-2 text-sm text-ink-muted">
              Probe {o.probe.tag} against {o.probe.referenceLabel} ({o.probe.referenceE25V.toFixed(4)} V at 25 °C). k is fitted when assays span at least {o.minTempSpanC} °C.
            </p>
          )}
          <VersionsTable versions={o.versions} timeZone={timeZone} />
        </Panel>
        {o.probe && <ProbeChecksPanel probe={o.probe} timeZone={timeZone} canWrite={canWrite} />}
      </div>
    </div>
  );
}

/** Calibration: formal-potential fits per tank, their residuals, and probe checks with due dates. */
export function CalibrationView({ user, tanks, timeZone, onCalibrationChanged }: { user: SessionUser; tanks: CalibrationTank[]; timeZone: string; onCalibrationChanged?: () => void }) {
  const [tankId, setTankId] = useState<number | null>(tanks[0]?.id ?? null);
  const schedule = useCheckSchedule();
  const overdue = schedule.data?.filter((p) => p.overdue) ?? [];
  return (
    <div className="mx-auto flex max-w-[100rem] flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <h1 className="text-2xl font-bold">Calibration</h1>
        <div className="w-64">
          <SelectField label="Tank" value={tankId == null ? '' : String(tankId)} onChange={(e) => setTankId(Number(e.target.value))} options={tanks.map((t) => ({ value: String(t.id), label: `${t.tag} · ${t.name}` }))} />
        </div>
      </div>
      {overdue.length > 0 && (
        <Panel title={`Probe checks overdue (${overdue.length})`}>
          <CheckScheduleTable probes={overdue} timeZone={timeZone} />
        </Panel>
      )}
      {tankId != null && <TankCalibration key={tankId} tankId={tankId} user={user} timeZone={timeZone} onCalibrationChanged={onCalibrationChanged} />}
    </div>
  );
}
