import { useState } from 'react';
import type { CalibrationOverview } from '@shared/schemas/calibration';
import { STANDARD_LABELS } from '@shared/schemas/probe-checks';
import { Button } from '../../../components/ui/button';
import { Panel } from '../../../components/ui/panel';
import { formatFixed, formatMv, formatTempC } from '../../../lib/format';
import { isoToSiteLocal } from '@shared/time/site-time';
import { useCheckSchedule } from '../api/get-check-schedule';
import { useProbeChecks } from '../api/get-probe-checks';
import { useProbeReplacements } from '../api/get-probe-replacements';
import { IntervalForm } from './interval-form';
import { ProbeCheckForm } from './probe-check-form';
import { ReplacementForm } from './replacement-form';

type Probe = NonNullable<CalibrationOverview['probe']>;

/** The tank's probe: check against a standard, its own interval, its check and replacement record. */
export function ProbeChecksPanel({ probe, timeZone, canWrite }: { probe: Probe; timeZone: string; canWrite: boolean }) {
  const [mode, setMode] = useState<'none' | 'interval' | 'replace'>('none');
  const schedule = useCheckSchedule();
  const checks = useProbeChecks(probe.id);
  const replacements = useProbeReplacements(probe.id);
  const due = schedule.data?.find((p) => p.probeId === probe.id);
  const at = (iso: string) => isoToSiteLocal(iso, timeZone).replace('T', ' ');

  return (
    <Panel
      title={`Probe checks · ${probe.tag}`}
      actions={canWrite && mode === 'none' && (
        <div className="flex gap-2">
          <Button size="sm" variant="ghost" onClick={() => setMode('interval')}>Interval…</Button>
          <Button size="sm" variant="ghost" onClick={() => setMode('replace')}>Log replacement…</Button>
        </div>
      )}
    >
      <div className="flex flex-col gap-4">
        {due && (
          <p className="text-sm">
            Every {formatFixed(due.intervalDays, due.intervalDays % 1 ? 1 : 0)} days · next due <strong>{at(due.dueAt)}</strong>
            {due.overdue && <span className="ml-2 rounded-sm bg-attention-2-soft px-1.5 font-semibold text-attention-2-ink"><span aria-hidden="true">▲ </span>Overdue</span>}
          </p>
        )}
        {mode === 'interval' && due && <IntervalForm probeId={probe.id} current={due.intervalDays} onDone={() => setMode('none')} />}
        {mode === 'replace' && <ReplacementForm probeId={probe.id} probeTag={probe.tag} timeZone={timeZone} onDone={() => setMode('none')} />}
        {canWrite && <ProbeCheckForm probe={probe} toleranceMv={probe.toleranceMv} timeZone={timeZone} />}
        <div>
          <h3 className="mb-1 font-semibold">Recent checks</h3>
          {checks.data?.length ? (
            <ul className="text-sm tabular-nums">
              {checks.data.map((c) => (
                <li key={c.id} className="border-t border-line py-1">
                  {at(c.checkedAt)} · {STANDARD_LABELS[c.standard]} at {formatTempC(c.tempC)} °C · read {formatMv(c.readingMv)} mV, expected {formatMv(c.expectedMv)} mV,
                  error {formatFixed(c.errorMv, 1)} mV (±{c.toleranceMv}) · <strong>{c.pass ? 'pass' : '✕ FAIL'}</strong> · {c.checkedBy.name}
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-ink-muted">No check recorded.</p>
          )}
        </div>
        <div>
          <h3 className="mb-1 font-semibold">Replacement log</h3>
          {replacements.data?.length ? (
            <ul className="text-sm">
              {replacements.data.map((r) => (
                <li key={r.id} className="border-t border-line py-1">
                  {at(r.replacedAt)} · {r.part} · “{r.reason}”{r.note && ` · ${r.note}`} · {r.createdBy.name}
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-ink-muted">No replacement logged.</p>
          )}
        </div>
      </div>
    </Panel>
  );
}
