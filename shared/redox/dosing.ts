/**
 * Dose advisor arithmetic: oxidant needed to raise a tank's ferric fraction.
 *   kmol Fe²⁺ = (f_target − f_now)·c_T·V / 55.845   (g/L × m³ = kg, kg / (g/mol) = kmol)
 *   kg oxidant = kmol Fe²⁺ · (mol oxidant per mol Fe²⁺) · M_oxidant / utilisation
 */
import { requireInRange, requireOneOf, requirePositive } from './guards';
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
