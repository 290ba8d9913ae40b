/**
 * The Dose advisor's arithmetic, step by step, so a metallurgist can check it by hand.
 * Every number comes from shared/redox (ferricFractionOf, oxidantDemand, OXIDANTS); this file
 * only lays the intermediate values out in words.
 */
import { IRON_MOLAR_MASS_G_PER_MOL, OXIDANTS, ferricFractionOf, oxidantDemand, type Oxidant } from '@shared/redox';
import type { DoseForm } from '@shared/schemas/dose';

export type DoseStep = { label: string; working: string; result: string };

export type DoseAdvice = {
  oxidant: Oxidant;
  fNow: number;
  fTarget: number;
  fe2ToOxidiseKmol: number;
  /** Oxidant to dose once to reach the target, kg (0 when the tank is already at or above it). */
  oxidantKg: number;
  /** Oxidant per hour to hold the target against the feed, kg/h (null without a feed flow). */
  holdKgPerH: number | null;
  steps: DoseStep[];
  holdSteps: DoseStep[];
  nothingToDose: boolean;
};

const n = (v: number, digits = 4) => (Math.abs(v) >= 1000 ? v.toFixed(0) : Number(v.toPrecision(digits)).toString());
const pct = (f: number) => `${(f * 100).toFixed(2)} %`;

export function adviseDose(form: DoseForm): DoseAdvice {
  const oxidant = OXIDANTS.find((o) => o.id === form.oxidant)!;
  const fNow = ferricFractionOf(form.ratioNow);
  const fTarget = ferricFractionOf(form.ratioTarget);
  const once = oxidantDemand({ ...form });
  const dF = fTarget - fNow;
  const ironKg = dF * form.totalFeGPerL * form.volumeM3;
  const oxKmol = once.fe2ToOxidiseKmol * oxidant.molPerMolFe2;
  const steps: DoseStep[] = [
    { label: 'Ferric fraction now', working: `f = r/(1 + r) = ${n(form.ratioNow)}/(1 + ${n(form.ratioNow)})`, result: pct(fNow) },
    { label: 'Ferric fraction at target', working: `f = ${n(form.ratioTarget)}/(1 + ${n(form.ratioTarget)})`, result: pct(fTarget) },
    {
      label: 'Fe²⁺ to oxidise',
      working: `(${pct(fTarget)} − ${pct(fNow)}) × ${n(form.totalFeGPerL)} g/L × ${n(form.volumeM3)} m³ = ${n(Math.max(0, ironKg))} kg Fe ÷ ${IRON_MOLAR_MASS_G_PER_MOL} kg/kmol`,
      result: `${n(once.fe2ToOxidiseKmol)} kmol`,
    },
    {
      label: `${oxidant.label} needed`,
      working: `${n(once.fe2ToOxidiseKmol)} kmol × ${oxidant.molPerMolFe2} mol per mol Fe²⁺ × ${oxidant.molarMassGPerMol} kg/kmol`,
      result: `${n(oxKmol * oxidant.molarMassGPerMol)} kg at 100 % use`,
    },
    { label: 'Allowing for utilisation', working: `÷ ${pct(form.utilisation)}`, result: `${n(once.oxidantKg)} kg` },
  ];

  let holdKgPerH: number | null = null;
  const holdSteps: DoseStep[] = [];
  if (form.feedFlowM3PerH !== undefined && form.feedFlowM3PerH > 0) {
    const feedRatio = form.feedRatio ?? form.ratioNow;
    // One hour of feed is treated as a volume to bring from the feed's ratio to the target.
    const hold = oxidantDemand({ ...form, volumeM3: form.feedFlowM3PerH, ratioNow: feedRatio });
    holdKgPerH = hold.oxidantKg;
    const fFeed = ferricFractionOf(feedRatio);
    holdSteps.push(
      { label: 'Ferric fraction of the feed', working: `f = ${n(feedRatio)}/(1 + ${n(feedRatio)})`, result: pct(fFeed) },
      {
        label: 'Fe²⁺ arriving per hour',
        working: `${n(form.feedFlowM3PerH)} m³/h × (${pct(fTarget)} − ${pct(fFeed)}) × ${n(form.totalFeGPerL)} g/L ÷ ${IRON_MOLAR_MASS_G_PER_MOL}`,
        result: `${n(hold.fe2ToOxidiseKmol)} kmol/h`,
      },
      {
        label: `${oxidant.label} to hold the target`,
        working: `× ${oxidant.molPerMolFe2} × ${oxidant.molarMassGPerMol} ÷ ${pct(form.utilisation)}`,
        result: `${n(hold.oxidantKg)} kg/h`,
      },
    );
  }
  return {
    oxidant, fNow, fTarget, fe2ToOxidiseKmol: once.fe2ToOxidiseKmol, oxidantKg: once.oxidantKg, holdKgPerH, steps, holdSteps,
    nothingToDose: once.oxidantKg === 0,
  };
}

/** Stated with every result, because the simple mass balance leaves these out. */
export const DOSE_ASSUMPTIONS = [
  'Total iron is the same in the tank and in the feed, and the tank is well mixed.',
  'Holding the target counts only the ferrous iron arriving with the feed. Ferric iron used up by the leach itself, and iron oxidised by bacteria, are not included: find the real demand by trial, with assays.',
  'The present ratio is a probe estimate: a tank reading high or low by the probe tolerance changes the dose.',
];
