import { useState } from 'react';
import { doseFormSchema } from '@shared/schemas/dose';
import { CautionNote } from '../../../components/ui/caution-note';
import { SelectField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/panel';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { Quantity } from '../../../components/ui/quantity';
import { issuesToFieldErrors } from '../../../lib/form';
import { useDoseInputs } from '../api/get-dose-inputs';
import { DOSE_ASSUMPTIONS, adviseDose } from '../utils/dose-steps';
import { DoseFormFields, inBand, initialDoseForm, suggestedTarget, type DoseFormText } from './dose-form';
import { DoseRange } from './dose-range';
import { DoseStepsView } from './dose-steps-view';
import { OxidantHazards } from './oxidant-hazards';

export type DoseTank = { id: number; tag: string; name: string };
const num = (s: string) => (s.trim() === '' ? undefined : Number(s.replace(',', '.')));

function Advisor({ tankId, timeZone }: { tankId: number; timeZone: string }) {
  const inputs = useDoseInputs(tankId);
  const [values, setValues] = useState<DoseFormText | null>(null);
  if (inputs.isPending) return <Loading label="Loading the tank…" />;
  if (inputs.isError) return <ErrorState title="The tank could not be loaded" detail={inputs.error.message} onRetry={() => inputs.refetch()} />;
  const v = values ?? initialDoseForm(inputs.data);
  const parsed = doseFormSchema.safeParse({
    ratioNow: num(v.ratioNow) ?? Number.NaN, ratioTarget: num(v.ratioTarget) ?? Number.NaN, volumeM3: num(v.volumeM3) ?? Number.NaN,
    totalFeGPerL: num(v.totalFeGPerL) ?? Number.NaN, oxidant: v.oxidant, utilisation: (num(v.utilisationPct) ?? Number.NaN) / 100,
    feedFlowM3PerH: num(v.feedFlowM3PerH), feedRatio: num(v.feedRatio),
  });
  const errors = parsed.success ? {} : issuesToFieldErrors(parsed.error.issues);
  const advice = parsed.success ? adviseDose(parsed.data) : null;
  const noTargetInBand = v.ratioTarget.trim() === '' && inBand(inputs.data, num(v.ratioNow));
  const askTarget = () => setValues({ ...v, ratioTarget: suggestedTarget(inputs.data) });

  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <Panel title={`Inputs for ${inputs.data.tankTag}`}>
        <DoseFormFields inputs={inputs.data} values={v} errors={errors} timeZone={timeZone} onChange={(k, val) => setValues((cur) => ({ ...(cur ?? v), [k]: val }))} />
      </Panel>
      <Panel title="Advice">
        {noTargetInBand ? (
          <div className="flex flex-col gap-2" data-testid="dose-advice">
            <p className="text-lg font-semibold" data-testid="dose-in-band">In band, no dose needed.</p>
            <p className="text-sm text-ink-muted">
              The present ratio lies inside the band {inputs.data.band.low}–{inputs.data.band.high}. Enter a target ratio to work out a dose anyway.
            </p>
            <div><button type="button" className="text-info-ink underline" onClick={askTarget}>Dose to {suggestedTarget(inputs.data)} anyway</button></div>
          </div>
        ) : !advice ? (
          <p className="text-ink-muted">Complete the inputs to see the dose.</p>
        ) : (
          <div className="flex flex-col gap-4" data-testid="dose-advice">
            {advice.nothingToDose ? (
              <p className="text-lg">The tank is at or above the target: no oxidant is needed to reach it.</p>
            ) : (
              <p className="text-lg">
                About <Quantity value={advice.oxidantKg.toFixed(advice.oxidantKg < 10 ? 1 : 0)} unit="kg" className="text-2xl" /> of {advice.oxidant.label} to reach the target
                {advice.holdKgPerH != null && <>, then about <Quantity value={advice.holdKgPerH.toFixed(1)} unit="kg/h" /> to hold it against the feed</>}.
              </p>
            )}
            {parsed.success && <DoseRange form={parsed.data} handledAs={v.form} uncertaintyFactor={inputs.data.uncertaintyFactor} />}
            <DoseStepsView title="Reaching the target" steps={advice.steps} />
            {advice.holdSteps.length > 0 && <DoseStepsView title="Holding it against the feed" steps={advice.holdSteps} />}
            <p className="text-sm text-ink-muted">
              Masses are of the pure oxidant; the quantity handled is worked out above where a form is chosen. For an ore, divide by its mass fraction. Stoichiometry: {advice.oxidant.source}.
            </p>
            <ul className="list-disc pl-5 text-sm text-ink-muted">{DOSE_ASSUMPTIONS.map((a) => <li key={a}>{a}</li>)}</ul>
            <OxidantHazards oxidant={advice.oxidant.id} label={advice.oxidant.label} />
          </div>
        )}
      </Panel>
    </div>
  );
}

/** Dose advisor: oxidant to bring a tank into its band. Advisory only — it sends no command to the plant. */
export function DoseView({ tanks, timeZone }: { tanks: DoseTank[]; timeZone: string }) {
  const [tankId, setTankId] = useState<number | null>(tanks[0]?.id ?? null);
  return (
    <div className="mx-auto flex max-w-7xl flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-bold">Dose advisor</h1>
          <p className="text-sm text-ink-muted">Advisory arithmetic: it sends no command to the plant. Dosing is done to the site's own procedure.</p>
        </div>
        <div className="w-64">
          <SelectField label="Tank" value={tankId == null ? '' : String(tankId)} onChange={(e) => setTankId(Number(e.target.value))} options={tanks.map((t) => ({ value: String(t.id), label: `${t.tag} · ${t.name}` }))} />
        </div>
      </div>
      {tankId != null && <Advisor key={tankId} tankId={tankId} timeZone={timeZone} />}
      <CautionNote />
    </div>
  );
}
