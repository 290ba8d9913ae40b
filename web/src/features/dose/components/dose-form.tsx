import { OXIDANT_FORMS, OXIDANTS, type OxidantId } from '@shared/redox';
import type { DoseInputs } from '@shared/schemas/dose';
import { SelectField, TextField } from '../../../components/ui/field';
import { useNow } from '../../../lib/clock';
import { formatAge, formatDateTime, formatRatio } from '../../../lib/format';
import type { FieldErrors } from '../../../lib/form';

export type DoseFormText = {
  ratioNow: string; ratioTarget: string; volumeM3: string; totalFeGPerL: string; oxidant: string; form: string; utilisationPct: string;
  feedFlowM3PerH: string; feedRatio: string;
};

/** The form an oxidant is usually handled in: air for oxygen, 50 % solution for peroxide. */
export const defaultFormOf = (oxidant: string) => OXIDANT_FORMS.find((f) => f.oxidant === oxidant && (f.id === 'air' || f.id === 'h2o2-50'))?.id ?? '';

/** A present ratio inside the band: no dose unless a target is asked for. */
export const inBand = (inputs: DoseInputs, ratio: number | undefined) => ratio != null && ratio >= inputs.band.low && ratio <= inputs.band.high;

/** The target to offer: the band's set target, else its middle. */
export const suggestedTarget = (inputs: DoseInputs) => String(Number((inputs.band.target ?? inputs.bandMiddle).toPrecision(3)));

/**
 * Starting values from the plant; every one can be overridden. No target for a tank in band (no dose
 * unless one is asked for); otherwise the band's target or middle. Bioleach circuits default to air,
 * since peroxide harms the culture (common practice); other circuits to hydrogen peroxide.
 */
export function initialDoseForm(inputs: DoseInputs): DoseFormText {
  const r = (v: number) => String(Number(v.toPrecision(3)));
  const oxidant: OxidantId = inputs.circuitProcess === 'bioleach' ? 'o2' : 'h2o2';
  return {
    ratioNow: inputs.latest ? r(inputs.latest.ratio) : '', ratioTarget: inBand(inputs, inputs.latest?.ratio) ? '' : suggestedTarget(inputs), volumeM3: String(inputs.volumeM3),
    totalFeGPerL: inputs.latestAssay ? r(inputs.latestAssay.feTotalGPerL) : '', oxidant, form: defaultFormOf(oxidant),
    // Sparged O₂ transfer varies too much with the tank to guess: the site enters its own figure.
    utilisationPct: oxidant === 'o2' ? '' : '100', feedFlowM3PerH: '', feedRatio: '',
  };
}

type Props = { inputs: DoseInputs; values: DoseFormText; errors: FieldErrors; timeZone: string; onChange: (k: keyof DoseFormText, v: string) => void };

export function DoseFormFields({ inputs, values, errors, timeZone, onChange }: Props) {
  const set = (k: keyof DoseFormText) => (e: { target: { value: string } }) => onChange(k, e.target.value);
  const now = useNow();
  const ageS = inputs.latest ? (now - Date.parse(inputs.latest.ts)) / 1000 : null;
  const u = inputs.uncertaintyFactor;
  const forms = OXIDANT_FORMS.filter((f) => f.oxidant === values.oxidant);
  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <TextField
        label="Present ratio" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.ratioNow} onChange={set('ratioNow')} error={errors.ratioNow}
        hint={inputs.latest ? `Probe, ${formatAge(ageS ?? 0)}${u ? `; uncertain ×/÷ ${u.toFixed(2)}` : ''}${inputs.latest.flag !== 'ok' ? '; outside the trusted range' : ''}` : 'No reading: enter it'}
      />
      <TextField
        label="Target ratio" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.ratioTarget} onChange={set('ratioTarget')}
        error={values.ratioTarget.trim() === '' ? undefined : errors.ratioTarget}
        hint={`Band ${formatRatio(inputs.band.low)}–${formatRatio(inputs.band.high)}; middle (geometric mean) ${formatRatio(inputs.bandMiddle)}${inputs.band.target != null ? `; set target ${formatRatio(inputs.band.target)}` : ''}`}
      />
      <TextField label="Tank volume" inputMode="decimal" unit="m³" value={values.volumeM3} onChange={set('volumeM3')} error={errors.volumeM3} />
      <TextField
        label="Total iron" inputMode="decimal" unit="g/L" value={values.totalFeGPerL} onChange={set('totalFeGPerL')} error={errors.totalFeGPerL}
        hint={inputs.latestAssay ? `Latest assay, sampled ${formatDateTime(inputs.latestAssay.sampledAt, timeZone)}` : 'No assay stored: enter it'}
      />
      <SelectField
        label="Oxidant" value={values.oxidant} onChange={(e) => { onChange('oxidant', e.target.value); onChange('form', defaultFormOf(e.target.value)); }}
        options={OXIDANTS.map((o) => ({ value: o.id, label: o.label }))} error={errors.oxidant}
        hint={inputs.circuitProcess === 'bioleach' ? 'Bioleach circuit: air or oxygen is usual; peroxide harms the culture (common practice).' : undefined}
      />
      {forms.length > 0 && (
        <SelectField label="Handled as" value={values.form} onChange={set('form')} options={forms.map((f) => ({ value: f.id, label: f.label }))} />
      )}
      <TextField
        label={values.oxidant === 'o2' ? 'Oxygen transfer efficiency' : 'Utilisation'} inputMode="decimal" unit="%" value={values.utilisationPct}
        onChange={set('utilisationPct')} error={errors.utilisation}
        hint={values.oxidant === 'o2'
          ? 'Share of the O₂ blown in that dissolves and oxidises Fe²⁺: often well under half in a sparged tank; use the site\'s figure.'
          : 'Share of the dosed oxidant that oxidises Fe²⁺: below 100 % in practice; use the site\'s figure.'}
      />
      <TextField label="Feed flow (optional)" inputMode="decimal" unit="m³/h" value={values.feedFlowM3PerH} onChange={set('feedFlowM3PerH')} error={errors.feedFlowM3PerH} />
      <TextField label="Feed ratio (optional)" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.feedRatio} onChange={set('feedRatio')} error={errors.feedRatio} hint="Defaults to the present ratio" />
    </div>
  );
}
