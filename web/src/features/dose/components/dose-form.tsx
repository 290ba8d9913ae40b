import { OXIDANTS } from '@shared/redox';
import type { DoseInputs } from '@shared/schemas/dose';
import { SelectField, TextField } from '../../../components/ui/field';
import { useNow } from '../../../lib/clock';
import { formatAge, formatDateTime, formatRatio } from '../../../lib/format';
import type { FieldErrors } from '../../../lib/form';

export type DoseFormText = {
  ratioNow: string; ratioTarget: string; volumeM3: string; totalFeGPerL: string; oxidant: string; utilisationPct: string; feedFlowM3PerH: string; feedRatio: string;
};

/** Starting values from the plant (target: the band middle); every one can be overridden. */
export function initialDoseForm(inputs: DoseInputs): DoseFormText {
  const r = (v: number) => String(Number(v.toPrecision(3)));
  return {
    ratioNow: inputs.latest ? r(inputs.latest.ratio) : '', ratioTarget: r(inputs.band.target ?? inputs.bandMiddle), volumeM3: String(inputs.volumeM3),
    totalFeGPerL: inputs.latestAssay ? r(inputs.latestAssay.feTotalGPerL) : '', oxidant: 'h2o2', utilisationPct: '100', feedFlowM3PerH: '', feedRatio: '',
  };
}

type Props = { inputs: DoseInputs; values: DoseFormText; errors: FieldErrors; timeZone: string; onChange: (k: keyof DoseFormText, v: string) => void };

export function DoseFormFields({ inputs, values, errors, timeZone, onChange }: Props) {
  const set = (k: keyof DoseFormText) => (e: { target: { value: string } }) => onChange(k, e.target.value);
  const now = useNow();
  const ageS = inputs.latest ? (now - Date.parse(inputs.latest.ts)) / 1000 : null;
  const u = inputs.uncertaintyFactor;
  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <TextField
        label="Present ratio" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.ratioNow} onChange={set('ratioNow')} error={errors.ratioNow}
        hint={inputs.latest ? `Probe, ${formatAge(ageS ?? 0)}${u ? `; uncertain ×/÷ ${u.toFixed(2)}` : ''}${inputs.latest.flag !== 'ok' ? '; outside the trusted range' : ''}` : 'No reading: enter it'}
      />
      <TextField
        label="Target ratio" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.ratioTarget} onChange={set('ratioTarget')} error={errors.ratioTarget}
        hint={`Band ${formatRatio(inputs.band.low)}–${formatRatio(inputs.band.high)}; middle (geometric mean) ${formatRatio(inputs.bandMiddle)}${inputs.band.target != null ? `; set target ${formatRatio(inputs.band.target)}` : ''}`}
      />
      <TextField label="Tank volume" inputMode="decimal" unit="m³" value={values.volumeM3} onChange={set('volumeM3')} error={errors.volumeM3} />
      <TextField
        label="Total iron" inputMode="decimal" unit="g/L" value={values.totalFeGPerL} onChange={set('totalFeGPerL')} error={errors.totalFeGPerL}
        hint={inputs.latestAssay ? `Latest assay, sampled ${formatDateTime(inputs.latestAssay.sampledAt, timeZone)}` : 'No assay stored: enter it'}
      />
      <SelectField label="Oxidant" value={values.oxidant} onChange={set('oxidant')} options={OXIDANTS.map((o) => ({ value: o.id, label: o.label }))} error={errors.oxidant} />
      <TextField
        label="Utilisation" inputMode="decimal" unit="%" value={values.utilisationPct} onChange={set('utilisationPct')} error={errors.utilisation}
        hint="Share of the dosed oxidant that oxidises Fe²⁺: below 100 % in practice; use the site's figure."
      />
      <TextField label="Feed flow (optional)" inputMode="decimal" unit="m³/h" value={values.feedFlowM3PerH} onChange={set('feedFlowM3PerH')} error={errors.feedFlowM3PerH} />
      <TextField label="Feed ratio (optional)" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.feedRatio} onChange={set('feedRatio')} error={errors.feedRatio} hint="Defaults to the present ratio" />
    </div>
  );
}
