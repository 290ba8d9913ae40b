import { useState, type ReactNode } from 'react';
import {
  CIRCUIT_PROCESS_LABELS, circuitInputSchema, circuitUpdateSchema, gatewayInputSchema, gatewayUpdateSchema, probeInputSchema, probeUpdateSchema,
  siteInputSchema, siteUpdateSchema, tankInputSchema, tankUpdateSchema, type GatewaySecret, type PlantSetup, type SetupGateway,
} from '@shared/schemas/plant-setup';
import type { z } from 'zod';
import { Button } from '../../../components/ui/button';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { Panel } from '../../../components/ui/panel';
import { usePlantSetup } from '../api/get-plant-setup';
import type { PartKind } from '../api/plant-setup-keys';
import { GatewayRow } from './gateway-row';
import { GatewaySecretNotice } from './gateway-secret';
import {
  CIRCUIT_FIELDS, GATEWAY_FIELDS, PROBE_FIELDS, SITE_FIELDS, TANK_FIELDS, circuitValues, gatewayValues, probeValues, siteValues, tankValues,
} from './part-fields';
import { PartForm, type FieldSpec } from './part-form';
import { RetireButton } from './retire-button';

type Editing = {
  kind: PartKind; id: number | null; title: string; fields: FieldSpec[]; initial: Record<string, string>;
  fixed?: Record<string, unknown>; schema: z.ZodType; anchor: string; siteTag?: string;
};

const SCHEMAS: Record<PartKind, [z.ZodType, z.ZodType]> = {
  sites: [siteInputSchema, siteUpdateSchema], circuits: [circuitInputSchema, circuitUpdateSchema], tanks: [tankInputSchema, tankUpdateSchema],
  probes: [probeInputSchema, probeUpdateSchema], gateways: [gatewayInputSchema, gatewayUpdateSchema],
};

/**
 * Sites → circuits → tanks → probes, and each site's gateways. Admins change sites, circuits and
 * tanks; admins and engineers change probes and gateways; others read (the server enforces it).
 */
export function PlantParts({ canEditStructure, canEditField }: { canEditStructure: boolean; canEditField: boolean }) {
  const setup = usePlantSetup();
  const [editing, setEditing] = useState<Editing | null>(null);
  const [secret, setSecret] = useState<{ s: GatewaySecret; siteTag: string } | null>(null);
  const [showRetired, setShowRetired] = useState(false);
  if (setup.isPending) return <Loading label="Loading the plant…" />;
  if (setup.isError) return <ErrorState title="The plant could not be loaded" detail={String(setup.error.message)} />;
  const p: PlantSetup = setup.data;
  const live = <T extends { retiredAt: string | null }>(rows: T[]) => rows.filter((r) => showRetired || !r.retiredAt);

  const open = (kind: PartKind, id: number | null, title: string, fields: FieldSpec[], initial: Record<string, string>, anchor: string, fixed?: Record<string, unknown>, siteTag?: string) =>
    setEditing({ kind, id, title, fields, initial, fixed, schema: SCHEMAS[kind][id === null ? 0 : 1], anchor, siteTag });
  const formAt = (anchor: string): ReactNode =>
    editing?.anchor === anchor ? (
      <PartForm
        key={anchor}
        title={editing.title}
        kind={editing.kind}
        id={editing.id}
        fields={editing.fields}
        initial={editing.initial}
        fixed={editing.fixed}
        schema={editing.schema}
        onDone={(saved) => {
          if (saved && 'password' in saved && editing.siteTag) setSecret({ s: saved as unknown as GatewaySecret, siteTag: editing.siteTag });
          setEditing(null);
        }}
      />
    ) : null;
  const add = (label: string, onClick: () => void, allowed: boolean) =>
    allowed ? <div><Button size="sm" onClick={onClick}>{label}</Button></div> : null;
  const edit = (allowed: boolean, onClick: () => void) =>
    allowed ? <button type="button" className="text-sm text-info-ink underline" onClick={onClick}>Edit</button> : null;
  const retiredNote = (r: { retiredAt: string | null }) => (r.retiredAt ? <span className="text-sm text-ink-muted">retired</span> : null);

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={showRetired} onChange={(e) => setShowRetired(e.target.checked)} /> Show retired parts
        </label>
        {add('Add site', () => open('sites', null, 'Add site', SITE_FIELDS(true), siteValues(), 'site-new'), canEditStructure)}
      </div>
      {formAt('site-new')}
      {secret && <GatewaySecretNotice secret={secret.s} siteTag={secret.siteTag} onClose={() => setSecret(null)} />}
      {p.sites.length === 0 && <p className="text-ink-muted">No site yet. {canEditStructure ? 'Add the first one.' : 'An admin adds sites.'}</p>}
      {live(p.sites).map((site) => {
        const circuits = live(p.circuits.filter((c) => c.siteId === site.id));
        const gateways: SetupGateway[] = live(p.gateways.filter((g) => g.siteId === site.id));
        const active = !site.retiredAt;
        return (
          <Panel key={site.id} title={`Site ${site.tag}`}>
            <div className="flex flex-col gap-3 p-4">
              <div className="flex flex-wrap items-baseline gap-3">
                <h2 className="text-xl font-bold">{site.tag}</h2>
                <span>{site.name}</span>
                <span className="text-sm text-ink-muted">{site.timeZone}</span>
                {retiredNote(site)}
                {edit(canEditStructure && active, () => open('sites', site.id, `Edit site ${site.tag}`, SITE_FIELDS(false), siteValues(site), `site-${site.id}`))}
                {canEditStructure && active && <RetireButton kind="sites" id={site.id} label={`site ${site.tag}`} />}
              </div>
              {formAt(`site-${site.id}`)}
              {circuits.map((c) => {
                const tanks = live(p.tanks.filter((t) => t.circuitId === c.id));
                return (
                  <section key={c.id} aria-label={`Circuit ${c.tag}`} className="rounded-md border border-line p-3">
                    <div className="flex flex-wrap items-baseline gap-3">
                      <h3 className="font-bold">{c.position}. {c.name}</h3>
                      <span className="text-sm text-ink-muted">{c.tag} · {CIRCUIT_PROCESS_LABELS[c.process]}</span>
                      {retiredNote(c)}
                      {edit(canEditStructure && !c.retiredAt, () => open('circuits', c.id, `Edit circuit ${c.tag}`, CIRCUIT_FIELDS(false), circuitValues(c), `circuit-${c.id}`))}
                      {canEditStructure && !c.retiredAt && <RetireButton kind="circuits" id={c.id} label={`circuit ${c.tag}`} />}
                    </div>
                    {formAt(`circuit-${c.id}`)}
                    <ul className="mt-2 flex flex-col">
                      {tanks.map((t) => {
                        const probes = live(p.probes.filter((pr) => pr.tankId === t.id));
                        const inService = probes.find((pr) => !pr.retiredAt);
                        return (
                          <li key={t.id} aria-label={`Tank ${t.tag}`} className="border-t border-line py-2">
                            <div className="flex flex-wrap items-baseline gap-3">
                              <span className="font-semibold">{t.position}. {t.tag}</span>
                              <span>{t.name}</span>
                              <span className="text-sm text-ink-muted">{t.volumeM3} m³{t.feTotalGPerL != null ? ` · Fe total ${t.feTotalGPerL} g/L` : ''}</span>
                              {retiredNote(t)}
                              {edit(canEditStructure && !t.retiredAt, () => open('tanks', t.id, `Edit tank ${t.tag}`, TANK_FIELDS(false), tankValues(t), `tank-${t.id}`))}
                              {canEditStructure && !t.retiredAt && <RetireButton kind="tanks" id={t.id} label={`tank ${t.tag}`} />}
                              {!inService && !t.retiredAt && add('Add probe', () => open('probes', null, `Add probe to ${t.tag}`, PROBE_FIELDS(true), probeValues(), `probe-new-${t.id}`, { tankId: t.id }), canEditField)}
                            </div>
                            {formAt(`tank-${t.id}`)}
                            {formAt(`probe-new-${t.id}`)}
                            {probes.map((pr) => (
                              <div key={pr.id} className="ml-6 mt-1 flex flex-col gap-1 text-sm" aria-label={`Probe ${pr.tag}`}>
                                <div className="flex flex-wrap items-baseline gap-3">
                                  <span className="font-mono">{pr.tag}</span>
                                  <span className="text-ink-muted">
                                    {pr.referenceId} ({pr.referenceE25V} V, {pr.referenceCoeffVPerK} V/K) · ±{pr.toleranceMv} mV · every {pr.intervalS} s · installed {pr.installedAt.slice(0, 10)}
                                  </span>
                                  {retiredNote(pr)}
                                  {edit(canEditField && !pr.retiredAt, () => open('probes', pr.id, `Edit probe ${pr.tag}`, PROBE_FIELDS(false), probeValues(pr), `probe-${pr.id}`))}
                                  {canEditField && !pr.retiredAt && <RetireButton kind="probes" id={pr.id} label={`probe ${pr.tag}`} />}
                                </div>
                                {pr.replacements.length > 0 && (
                                  <p className="text-ink-muted">Replaced: {pr.replacements.map((r) => `${r.replacedAt.slice(0, 10)} ${r.part} (${r.reason})`).join('; ')}</p>
                                )}
                                {formAt(`probe-${pr.id}`)}
                              </div>
                            ))}
                          </li>
                        );
                      })}
                    </ul>
                    {!c.retiredAt && add('Add tank', () => open('tanks', null, `Add tank to ${c.name}`, TANK_FIELDS(true), tankValues(undefined, tanks.length + 1), `tank-new-${c.id}`, { circuitId: c.id }), canEditStructure)}
                    {formAt(`tank-new-${c.id}`)}
                  </section>
                );
              })}
              {active && add('Add circuit', () => open('circuits', null, `Add circuit to ${site.tag}`, CIRCUIT_FIELDS(true), circuitValues(undefined, circuits.length + 1), `circuit-new-${site.id}`, { siteId: site.id }), canEditStructure)}
              {formAt(`circuit-new-${site.id}`)}
              <section aria-label={`Gateways of ${site.tag}`}>
                <div className="flex items-baseline gap-3">
                  <h3 className="font-bold">Gateways</h3>
                  {active && add('Add gateway', () => open('gateways', null, `Add gateway to ${site.tag}`, GATEWAY_FIELDS(true), gatewayValues(), `gateway-new-${site.id}`, { siteId: site.id }, site.tag), canEditField)}
                </div>
                {formAt(`gateway-new-${site.id}`)}
                <ul>
                  {gateways.map((g) => (
                    <div key={g.id}>
                      <GatewayRow gateway={g} canEdit={canEditField} onSecret={(s) => setSecret({ s, siteTag: site.tag })}
                        onEdit={() => open('gateways', g.id, `Edit gateway ${g.username}`, GATEWAY_FIELDS(false), gatewayValues(g), `gateway-${g.id}`)} />
                      {formAt(`gateway-${g.id}`)}
                    </div>
                  ))}
                </ul>
              </section>
            </div>
          </Panel>
        );
      })}
    </div>
  );
}
