/**
 * Dose advisor arithmetic: oxidant needed to raise a tank's ferric fraction.
 *   kmol Fe²⁺ = (f_target − f_now)·c_T·V / 55.845   (g/L × m³ = kg, kg / (g/mol) = kmol)
 *   kg oxidant = kmol Fe²⁺ · (mol oxidant per mol Fe²⁺) · M_oxidant / utilisation
 */
import { requireInRange, requireOneOf, requirePositive } from './guards';
import { GAS_CONSTANT_J_PER_MOL_K, KELVIN_OFFSET } from './constants';
import { ferricFractionOf } from './nernst';

/** Molar mass of iron, g/mol (IUPAC standard atomic weight). */
export const IRON_MOLAR_MASS_G_PER_MOL = 55.845;

export type OxidantId = 'h2o2' | 'mno2' | 'o2';

export type Oxidant = {
  id: OxidantId;
  label: string;
  molarMassGPerMol: number;
  /** Moles of oxidant consumed per mole of Fe²⁺ oxidised, before utilisation. */
  molPerMolFe2: number;
  source: string;
};

// Stoichiometry from the balanced half-reactions in acid; molar masses from standard atomic weights.
export const OXIDANTS: Oxidant[] = [
  {
    id: 'h2o2',
    label: 'Hydrogen peroxide (H₂O₂)',
    molarMassGPerMol: 34.0147,
    molPerMolFe2: 0.5,
    source: 'H₂O₂ + 2Fe²⁺ + 2H⁺ → 2Fe³⁺ + 2H₂O; M from standard atomic weights',
  },
  {
    id: 'mno2',
    label: 'Manganese dioxide (MnO₂)',
    molarMassGPerMol: 86.9368,
    molPerMolFe2: 0.5,
    source: 'MnO₂ + 2Fe²⁺ + 4H⁺ → Mn²⁺ + 2Fe³⁺ + 2H₂O; M from standard atomic weights',
  },
  {
    id: 'o2',
    label: 'Oxygen (O₂, as air or pure)',
    molarMassGPerMol: 31.998,
    molPerMolFe2: 0.25,
    source: 'O₂ + 4Fe²⁺ + 4H⁺ → 4Fe³⁺ + 2H₂O; M from standard atomic weights',
  },
];

// Bounds only to keep products finite: far beyond any real tank or liquor.
const MAX_VOLUME_M3 = 1e7;
const MAX_TOTAL_FE_G_PER_L = 1000;

/**
 * Oxidant needed to move a tank from ratioNow to ratioTarget (both Fe³⁺/Fe²⁺).
 * @param input.volumeM3 solution volume, m³, in [0, 1e7]
 * @param input.totalFeGPerL total iron, g/L, in [0, 1000]
 * @param input.utilisation fraction of dosed oxidant that oxidises Fe²⁺, in (0, 1]
 * @returns Fe²⁺ to oxidise in kmol and oxidant mass in kg; both 0 when the target ≤ the present ratio
 */
export function oxidantDemand(input: {
  volumeM3: number;
  totalFeGPerL: number;
  ratioNow: number;
  ratioTarget: number;
  oxidant: OxidantId;
  utilisation: number;
}): { fe2ToOxidiseKmol: number; oxidantKg: number } {
  const volumeM3 = requireInRange('volumeM3', input.volumeM3, 0, MAX_VOLUME_M3, 'm³');
  const totalFeGPerL = requireInRange('totalFeGPerL', input.totalFeGPerL, 0, MAX_TOTAL_FE_G_PER_L, 'g/L');
  const fNow = ferricFractionOf(requirePositive('ratioNow', input.ratioNow));
  const fTarget = ferricFractionOf(requirePositive('ratioTarget', input.ratioTarget));
  const id = requireOneOf('oxidant', input.oxidant, OXIDANTS.map((o) => o.id));
  const utilisation = requirePositive('utilisation', input.utilisation, 1);
  const oxidant = OXIDANTS.find((o) => o.id === id) as Oxidant;

  // Lowering the ratio needs a reductant, not an oxidant: the advisor then doses nothing.
  if (fTarget <= fNow) return { fe2ToOxidiseKmol: 0, oxidantKg: 0 };
  const fe2ToOxidiseKmol = ((fTarget - fNow) * totalFeGPerL * volumeM3) / IRON_MOLAR_MASS_G_PER_MOL;
  const oxidantKg = (fe2ToOxidiseKmol * oxidant.molPerMolFe2 * oxidant.molarMassGPerMol) / utilisation;
  // Only a vanishing utilisation (~1e-300) can overflow here; refuse instead of returning Infinity.
  if (!Number.isFinite(oxidantKg)) {
    throw new RangeError(`utilisation must be a finite number in (0, 1] large enough for a finite dose (got ${utilisation})`);
  }
  return { fe2ToOxidiseKmol, oxidantKg };
}

/** A form in which an oxidant is handled on site. */
export type OxidantForm = {
  id: string;
  oxidant: OxidantId;
  label: string;
  /** Mass fraction of the oxidant in what is handled (1 for pure oxygen, 0.2095 by volume for air: see kind). */
  massFraction: number;
  kind: 'liquid' | 'gas';
  /** Density of the solution, kg/L (liquids only). */
  densityKgPerL?: number;
  /** Mole fraction of O₂ in the gas (gases only). */
  o2MoleFraction?: number;
  source: string;
};

// Densities of H₂O₂ solutions at 20 °C (recalled, not yet checked against a published table: the
// screen calls them typical and asks for the supplier's figure); the O₂ content of dry air. Pure MnO₂ ore grades vary too
// much to tabulate: the advisor gives its mass only.
export const OXIDANT_FORMS: OxidantForm[] = [
  { id: 'h2o2-35', oxidant: 'h2o2', label: 'H₂O₂ 35 % w/w', massFraction: 0.35, kind: 'liquid', densityKgPerL: 1.132,
    source: 'density 1.132 kg/L at 20 °C (typical; use the density on your supplier’s data sheet)' },
  { id: 'h2o2-50', oxidant: 'h2o2', label: 'H₂O₂ 50 % w/w', massFraction: 0.5, kind: 'liquid', densityKgPerL: 1.196,
    source: 'density 1.196 kg/L at 20 °C (typical; use the density on your supplier’s data sheet)' },
  { id: 'h2o2-70', oxidant: 'h2o2', label: 'H₂O₂ 70 % w/w', massFraction: 0.7, kind: 'liquid', densityKgPerL: 1.29,
    source: 'density 1.29 kg/L at 20 °C (typical; use the density on your supplier’s data sheet)' },
  { id: 'air', oxidant: 'o2', label: 'Air', massFraction: 1, kind: 'gas', o2MoleFraction: 0.2095,
    source: 'O₂ is 20.95 % by volume of dry air (U.S. Standard Atmosphere, 1976)' },
  { id: 'o2', oxidant: 'o2', label: 'Oxygen (pure)', massFraction: 1, kind: 'gas', o2MoleFraction: 1, source: 'pure O₂' },
];

/** Molar volume of an ideal gas at normal conditions (0 °C, 101.325 kPa), m³/kmol = R·273.15/101325 × 1000. */
export const MOLAR_VOLUME_NORMAL_M3_PER_KMOL = (GAS_CONSTANT_J_PER_MOL_K * KELVIN_OFFSET) / 101.325;

/**
 * What is handled for a dose of pure oxidant: litres of a solution, or normal cubic metres of gas.
 * @param input.oxidantKg pure oxidant to deliver, kg (already divided by utilisation or transfer efficiency)
 * @param input.form id from OXIDANT_FORMS, for the same oxidant
 * @returns litres (liquids) or Nm³ at 0 °C and 101.325 kPa (gases), with the form used
 */
export function oxidantQuantity(input: { oxidantKg: number; oxidant: OxidantId; form: string }): { amount: number; unit: 'L' | 'Nm³'; form: OxidantForm } {
  const kg = requireInRange('oxidantKg', input.oxidantKg, 0, Number.MAX_VALUE, 'kg');
  const form = OXIDANT_FORMS.find((f) => f.id === input.form && f.oxidant === input.oxidant);
  if (!form) {
    const ids = OXIDANT_FORMS.filter((f) => f.oxidant === input.oxidant).map((f) => `'${f.id}'`).join(', ') || 'none';
    throw new RangeError(`form must be one of ${ids} for ${input.oxidant} (got ${JSON.stringify(input.form)})`);
  }
  if (form.kind === 'liquid') return { amount: kg / form.massFraction / form.densityKgPerL!, unit: 'L', form };
  const o2 = OXIDANTS.find((o) => o.id === 'o2')!;
  const kmolO2 = kg / o2.molarMassGPerMol;
  return { amount: (kmolO2 * MOLAR_VOLUME_NORMAL_M3_PER_KMOL) / form.o2MoleFraction!, unit: 'Nm³', form };
}

/**
 * The dose over the probe's uncertainty: the present ratio may be off by the tolerance either way
 * (ratio ×/÷ factor), so the dose lies between the doses for ratioNow·factor and ratioNow/factor.
 * @param input as oxidantDemand, plus uncertaintyFactor (≥ 1) from ratioUncertainty
 * @returns the central dose and the low/high doses, kg (0 where that end is already at target)
 */
export function oxidantDemandRange(input: Parameters<typeof oxidantDemand>[0] & { uncertaintyFactor: number }): { lowKg: number; centralKg: number; highKg: number } {
  const factor = requireInRange('uncertaintyFactor', input.uncertaintyFactor, 1, 1e6);
  const at = (ratioNow: number) => oxidantDemand({ ...input, ratioNow }).oxidantKg;
  return { lowKg: at(input.ratioNow * factor), centralKg: at(input.ratioNow), highKg: at(input.ratioNow / factor) };
}
