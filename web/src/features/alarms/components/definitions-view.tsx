import { useState } from 'react';
import { CautionNote } from '../../../components/ui/caution-note';
import { SelectField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useActiveAlarms } from '../api/get-active-alarms';
import { useDefinitions } from '../api/get-definitions';
import { DefinitionTable } from './definition-table';
import { SETTINGS_ROLES, type DeskContext } from './desk-types';
import { TemplateForm } from './template-form';

type Props = DeskContext & { tankId: number | undefined; onTank: (id: number) => void };

/**
 * The Alarm desk's definitions view: one tank's alarms with their limits, delays and
 * rationalisation. Metallurgists and admins change them (with a reason), take them out of
 * service and apply circuit templates; everyone else reads them.
 */
export function DefinitionsView({ role, timeZone, places, tankId, onTank }: Props) {
  const tank = places.find((p) => p.tankId === tankId) ?? places[0];
  const definitions = useDefinitions(tank?.tankId ?? 0);
  const active = useActiveAlarms();
  const [saved, setSaved] = useState<string | null>(null);
  const canEdit = SETTINGS_ROLES.includes(role);
  if (!tank) return <p className="py-8 text-center text-ink-muted">No tanks are set up yet.</p>;

  const alarms = (active.data?.alarms ?? []).filter((a) => a.tankId === tank.tankId);
  return (
    <div className="flex flex-col gap-4" data-testid="definitions-view">
      <div className="flex flex-wrap items-end gap-4">
        <div className="w-64">
          <SelectField label="Tank" value={String(tank.tankId)} onChange={(e) => (setSaved(null), onTank(Number(e.target.value)))}
            options={places.map((p) => ({ value: String(p.tankId), label: `${p.tankTag} · ${p.circuitName}` }))} />
        </div>
        <p className="max-w-3xl pb-2 text-sm text-ink-muted">
          {canEdit
            ? 'Every change needs a reason and is kept in the change record. Ratio limits follow the tank’s band, which is changed on Bands.'
            : 'Metallurgists and admins change these settings; you can read them here.'}
        </p>
      </div>
      {saved && <Notice tone="info">{saved}</Notice>}
      {definitions.isPending ? (
        <Loading label="Loading alarm definitions…" />
      ) : definitions.isError ? (
        <ErrorState title="Alarm definitions could not be loaded" detail={definitions.error.message} onRetry={() => definitions.refetch()} />
      ) : definitions.data.length === 0 ? (
        <p className="py-6 text-center text-ink-muted">{tank.tankTag} has no alarm definitions yet.{canEdit && ' Apply a circuit template below to create them.'}</p>
      ) : (
        <DefinitionTable key={tank.tankId} definitions={definitions.data} alarms={alarms} timeZone={timeZone} canEdit={canEdit} onSaved={setSaved} />
      )}
      {canEdit && (
        <details className="rounded-md border border-line bg-panel-2 p-4" open={definitions.data?.length === 0}>
          <summary className="cursor-pointer font-bold">Apply a circuit template</summary>
          <div className="mt-3"><TemplateForm key={tank.tankId} places={places} tankId={tank.tankId} /></div>
        </details>
      )}
      <CautionNote />
    </div>
  );
}
