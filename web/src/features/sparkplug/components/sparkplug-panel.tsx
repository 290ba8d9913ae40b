import { useState, type FormEvent } from 'react';
import {
  sparkplugGroupCreateSchema, sparkplugMappingCreateSchema, type SparkplugMapping, type SparkplugRole,
} from '@shared/schemas/sparkplug';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/panel';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useCreateGroup } from '../api/create-group';
import { useCreateMapping } from '../api/create-mapping';
import { useDeleteGroup } from '../api/delete-group';
import { useDeleteMapping } from '../api/delete-mapping';
import { useSparkplug } from '../api/get-sparkplug';

export type SparkplugSiteOption = { id: number; tag: string; probes: { id: number; label: string }[] };

const ROLE_OPTIONS: { value: SparkplugRole; label: string }[] = [
  { value: 'orp', label: 'ORP (mV)' },
  { value: 'temp', label: 'Temperature (°C)' },
];

const EMPTY_MAPPING = { groupId: '', edgeNodeId: '', deviceId: '', metricName: '', role: 'orp' as SparkplugRole, probeId: '' };

function where(m: Pick<SparkplugMapping, 'groupId' | 'edgeNodeId' | 'deviceId'>): string {
  return [m.groupId, m.edgeNodeId, m.deviceId].filter(Boolean).join(' / ');
}

/** Plant setup: which Sparkplug groups belong to which site, and which metric feeds which probe. */
export function SparkplugPanel({ sites, timeZone }: { sites: SparkplugSiteOption[]; timeZone: string }) {
  const setup = useSparkplug();
  const createGroup = useCreateGroup();
  const deleteGroup = useDeleteGroup();
  const createMapping = useCreateMapping();
  const deleteMapping = useDeleteMapping();
  const [group, setGroup] = useState({ siteId: String(sites[0]?.id ?? ''), groupId: '' });
  const [groupErrors, setGroupErrors] = useState<FieldErrors>({});
  const [mapping, setMapping] = useState(EMPTY_MAPPING);
  const [mappingErrors, setMappingErrors] = useState<FieldErrors>({});
  const groups = setup.data?.groups ?? [];
  const siteOfGroup = groups.find((g) => g.groupId === mapping.groupId)?.siteId;
  const probeOptions = (sites.find((s) => s.id === siteOfGroup)?.probes ?? sites.flatMap((s) => s.probes))
    .map((p) => ({ value: String(p.id), label: p.label }));
  const fmt = new Intl.DateTimeFormat('en-GB', { timeZone, dateStyle: 'short', timeStyle: 'medium' });

  const addGroup = (e: FormEvent) => {
    e.preventDefault();
    const parsed = sparkplugGroupCreateSchema.safeParse({ siteId: Number(group.siteId), groupId: group.groupId });
    if (!parsed.success) return setGroupErrors(issuesToFieldErrors(parsed.error.issues));
    setGroupErrors({});
    createGroup.mutate(parsed.data, { onSuccess: () => setGroup((g) => ({ ...g, groupId: '' })) });
  };
  const addMapping = (e: FormEvent) => {
    e.preventDefault();
    const parsed = sparkplugMappingCreateSchema.safeParse({ ...mapping, probeId: Number(mapping.probeId) || 0 });
    if (!parsed.success) return setMappingErrors(issuesToFieldErrors(parsed.error.issues));
    setMappingErrors({});
    createMapping.mutate(parsed.data, { onSuccess: () => setMapping((m) => ({ ...m, metricName: '', probeId: '' })) });
  };
  const gServer = serverFieldErrors(createGroup.error);
  const mServer = serverFieldErrors(createMapping.error);
  const setM = (k: keyof typeof EMPTY_MAPPING) => (e: { target: { value: string } }) => setMapping((v) => ({ ...v, [k]: e.target.value }));

  return (
    <Panel title="Sparkplug B edge nodes">
      <div className="flex flex-col gap-5">
        <p className="text-sm text-ink-muted">
          Gateways that speak Sparkplug B (Eclipse Sparkplug 3.0) publish under <code>spBv1.0/&lt;group&gt;/…</code> with a device
          account of the group&apos;s site. Ferrisight is their host application{setup.data ? <> with host id <code>{setup.data.hostId}</code></> : null}.
          Map each probe&apos;s ORP metric (mV) and its temperature metric (°C); aliases are learned from the births.
        </p>

        <section aria-label="Groups" className="flex flex-col gap-3">
          <h3 className="font-bold">Groups</h3>
          {groups.length === 0 ? <p className="text-sm">No groups yet.</p> : (
            <ul className="flex flex-col gap-1">
              {groups.map((g) => (
                <li key={g.id} className="flex items-center justify-between gap-3">
                  <span><code>{g.groupId}</code> → site {g.siteTag}</span>
                  <Button size="sm" onClick={() => deleteGroup.mutate(g.id)} aria-label={`Remove group ${g.groupId}`}>Remove</Button>
                </li>
              ))}
            </ul>
          )}
          <form onSubmit={addGroup} noValidate aria-label="Add Sparkplug group" className="grid gap-3 sm:grid-cols-[1fr_1fr_auto] sm:items-end">
            <SelectField label="Site" value={group.siteId} onChange={(e) => setGroup((g) => ({ ...g, siteId: e.target.value }))}
              options={sites.map((s) => ({ value: String(s.id), label: s.tag }))} error={groupErrors.siteId ?? gServer.siteId} />
            <TextField label="Group id" value={group.groupId} onChange={(e) => setGroup((g) => ({ ...g, groupId: e.target.value }))}
              error={groupErrors.groupId ?? gServer.groupId} autoComplete="off" />
            <Button type="submit" variant="primary" disabled={createGroup.isPending}>Add group</Button>
          </form>
          <FormError>{formMessage(createGroup.error) ?? formMessage(deleteGroup.error)}</FormError>
        </section>

        <section aria-label="Metric mapping" className="flex flex-col gap-3">
          <h3 className="font-bold">Metric → probe</h3>
          {(setup.data?.mappings.length ?? 0) === 0 ? <p className="text-sm">No metrics mapped yet.</p> : (
            <table className="w-full text-left text-sm">
              <thead><tr><th>Edge node / device</th><th>Metric</th><th>Is</th><th>Probe</th><th /></tr></thead>
              <tbody>
                {setup.data!.mappings.map((m) => (
                  <tr key={m.id} className="border-t border-line">
                    <td>{where(m)}</td>
                    <td><code>{m.metricName}</code></td>
                    <td>{m.role === 'orp' ? 'ORP, mV' : 'Temperature, °C'}</td>
                    <td>{m.probeTag} ({m.siteTag})</td>
                    <td className="text-right">
                      <Button size="sm" onClick={() => deleteMapping.mutate(m.id)} aria-label={`Remove mapping of ${m.metricName}`}>Remove</Button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <form onSubmit={addMapping} noValidate aria-label="Map a Sparkplug metric" className="grid gap-3 sm:grid-cols-3">
            <SelectField label="Group" value={mapping.groupId} onChange={setM('groupId')}
              options={[{ value: '', label: 'Choose…' }, ...groups.map((g) => ({ value: g.groupId, label: g.groupId }))]}
              error={mappingErrors.groupId ?? mServer.groupId} />
            <TextField label="Edge node id" value={mapping.edgeNodeId} onChange={setM('edgeNodeId')} error={mappingErrors.edgeNodeId ?? mServer.edgeNodeId} autoComplete="off" />
            <TextField label="Device id" value={mapping.deviceId} onChange={setM('deviceId')} hint="Empty for a metric of the edge node itself"
              error={mappingErrors.deviceId ?? mServer.deviceId} autoComplete="off" />
            <TextField label="Metric name" value={mapping.metricName} onChange={setM('metricName')} error={mappingErrors.metricName ?? mServer.metricName} autoComplete="off" />
            <SelectField label="Is" value={mapping.role} onChange={setM('role')} options={ROLE_OPTIONS} error={mappingErrors.role ?? mServer.role} />
            <SelectField label="Probe" value={mapping.probeId} onChange={setM('probeId')} options={[{ value: '', label: 'Choose…' }, ...probeOptions]}
              error={mappingErrors.probeId ?? mServer.probeId} />
            <div className="sm:col-span-3 flex justify-end">
              <Button type="submit" variant="primary" disabled={createMapping.isPending}>Map metric</Button>
            </div>
          </form>
          <FormError>{formMessage(createMapping.error) ?? formMessage(deleteMapping.error)}</FormError>
        </section>

        <section aria-label="Host events" className="flex flex-col gap-2">
          <h3 className="font-bold">Recent births, deaths and rebirth requests</h3>
          {(setup.data?.events.length ?? 0) === 0 ? <p className="text-sm">Nothing yet.</p> : (
            <ul className="flex max-h-64 flex-col gap-1 overflow-y-auto text-sm">
              {setup.data!.events.map((e) => (
                <li key={e.id}>
                  <span className="tabular-nums text-ink-muted">{fmt.format(new Date(e.at))}</span> {where(e)}: {e.detail}
                </li>
              ))}
            </ul>
          )}
        </section>
      </div>
    </Panel>
  );
}
