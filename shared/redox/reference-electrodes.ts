/**
 * Reference electrodes and their potential vs SHE at a given temperature.
 * Published values disagree by 2–4 mV (8–14 % in ratio), so every entry carries the value
 * chosen, its source and the temperatures that source covers; a probe may also carry its
 * maker's own table of potential against temperature.
 */
import { KELVIN_OFFSET, POTENTIAL_LIMIT_V, TEMP_COEFF_LIMIT_V_PER_K, TEMP_MAX_C, TEMP_MIN_C } from './constants';
import { requireInRange, requireTempC } from './guards';

/** One row of a maker's data sheet: potential vs SHE at a temperature. */
export type ReferenceTablePoint = { tempC: number; eV: number };

export type ReferenceElectrode = {
  id: string;
  label: string;
  /** Potential vs SHE at 25 °C, V. */
  e25V: number;
  /** Temperature coefficient at 25 °C, V/K (the whole law for linear electrodes). */
  coeffVPerK: number;
  source: string;
  /** A maker's table (potential vs temperature), interpolated linearly; overrides every other law. */
  table?: ReferenceTablePoint[];
};

/** How a built-in electrode follows temperature, with the range its source covers. */
type Law = {
  kind: 'linear' | 'agcl-chloride';
  minC: number;
  maxC: number;
  /** Highest temperature the electrode is used at (calomel: common practice about 70 °C). */
  usableMaxC?: number;
  rangeSource: string;
};

/**
 * Standard potential of AgCl + e⁻ ⇌ Ag + Cl⁻ vs SHE, 0–95 °C, V (t in °C):
 * E° = 0.23659 − 4.8564e-4·t − 3.4205e-6·t² + 5.869e-9·t³, the fit to the EMF measurements of
 * Bates & Bower (1954, J. Res. NBS 53:283) as reproduced by Bard, Parsons & Jordan,
 * Standard Potentials in Aqueous Solution (1985). It gives 0.22240 V at 25 °C against the
 * paper's 0.22234 V.
 */
export function agclStandardPotentialV(tempC: number): number {
  return 0.23659 - 4.8564e-4 * tempC - 3.4205e-6 * tempC ** 2 + 5.869e-9 * tempC ** 3;
}
const AGCL_E0_25 = agclStandardPotentialV(25);
const BATES_BOWER = 'E° of Ag/AgCl from Bates & Bower (1954, J. Res. NBS 53:283), 0–95 °C, with the filling solution\'s chloride activity fixed at the value the 25 °C potential implies';

/**
 * Ag/AgCl in a KCl filling of fixed strength: E = E°(T) − (R·T/F)·ln a(Cl⁻). The chloride
 * activity is taken from the tabulated 25 °C potential and held: KCl's activity coefficient
 * changes by a few per cent between 25 and 95 °C, under a millivolt.
 */
function agclChlorideV(e25V: number, tempC: number): number {
  return agclStandardPotentialV(tempC) - ((tempC + KELVIN_OFFSET) / (25 + KELVIN_OFFSET)) * (AGCL_E0_25 - e25V);
}

/** dE/dT of the chloride law at 25 °C, V/K, shown as the electrode's coefficient. */
function agclChlorideCoeff(e25V: number): number {
  return (agclChlorideV(e25V, 25.5) - agclChlorideV(e25V, 24.5)) / 1;
}

const SKOOG_RANGE = 'Skoog et al. table at 15, 25 and 35 °C';
const agcl = (id: string, label: string, e25V: number, source: string) =>
  ({ id, label, e25V, coeffVPerK: Math.round(agclChlorideCoeff(e25V) * 1e7) / 1e7, source: `${source}; ${BATES_BOWER}` });

// Where two books differ on a 25 °C value, both are listed as separate ids so a metallurgist
// can pick per probe. KCl-strength electrodes follow Bates & Bower's E°(T); saturated ones
// (whose chloride activity rises with KCl's solubility) follow the only tables we have, 15–35 °C.
export const REFERENCE_ELECTRODES: ReferenceElectrode[] = [
  {
    id: 'agcl-sat',
    label: 'Ag/AgCl, saturated KCl',
    e25V: 0.199,
    // (0.189 - 0.209) V / 20 K from the 15/25/35 °C table 0.209/0.199/0.189 V.
    coeffVPerK: -0.001,
    source: 'Skoog et al. (also Sawyer): 0.199 V; -1.0 mV/K from the 15/25/35 °C values 0.209/0.199/0.189 V',
  },
  {
    id: 'agcl-sat-bf',
    label: 'Ag/AgCl, saturated KCl (Bard & Faulkner)',
    e25V: 0.197,
    coeffVPerK: -0.001,
    source: 'Bard & Faulkner: 0.197 V; -1.0 mV/K from the Skoog 15/25/35 °C table (0.209/0.199/0.189 V)',
  },
  agcl('agcl-3.5m', 'Ag/AgCl, 3.5 M KCl', 0.205, 'Skoog et al.: 0.205 V at 25 °C'),
  agcl('agcl-3m', 'Ag/AgCl, 3 M KCl', 0.21, 'Published tables: 0.210 V at 25 °C (others give 0.207 V; enter the probe maker\'s value where known)'),
  agcl('agcl-1m', 'Ag/AgCl, 1 M KCl', 0.236, 'Published tables: 0.236 V at 25 °C'),
  {
    id: 'sce',
    label: 'Saturated calomel (SCE)',
    e25V: 0.2412,
    // (0.2376 - 0.2511) V / 20 K from the Skoog 15/25/35 °C saturated calomel column.
    coeffVPerK: -0.000675,
    source: 'Bard & Faulkner: 0.2412 V (Skoog et al. give 0.2444 V); -0.675 mV/K from the Skoog 15/25/35 °C values 0.2511/0.2444/0.2376 V; not used above about 70 °C (common practice)',
  },
  {
    id: 'sce-skoog',
    label: 'Saturated calomel (SCE, Skoog)',
    e25V: 0.2444,
    coeffVPerK: -0.000675,
    source: 'Skoog et al.: 0.2444 V; -0.675 mV/K from their 15/25/35 °C values 0.2511/0.2444/0.2376 V; not used above about 70 °C (common practice)',
  },
  {
    id: 'sce-bf',
    label: 'Saturated calomel (SCE, Bard & Faulkner)',
    e25V: 0.2412,
    coeffVPerK: -0.000675,
    source: 'Bard & Faulkner: 0.2412 V; -0.675 mV/K from the Skoog 15/25/35 °C values; not used above about 70 °C (common practice)',
  },
  {
    id: 'she',
    label: 'Standard hydrogen electrode (SHE)',
    e25V: 0,
    // 0 V at every temperature by convention, so no temperature coefficient.
    coeffVPerK: 0,
    source: 'Definition: 0 V at all temperatures (IUPAC convention)',
  },
];

const CALOMEL: Law = { kind: 'linear', minC: 15, maxC: 35, usableMaxC: 70, rangeSource: `${SKOOG_RANGE}; calomel is not used above about 70 °C (common practice)` };
const LAWS = new Map<string, Law>([
  ['agcl-sat', { kind: 'linear', minC: 15, maxC: 35, rangeSource: SKOOG_RANGE }],
  ['agcl-sat-bf', { kind: 'linear', minC: 15, maxC: 35, rangeSource: SKOOG_RANGE }],
  ['agcl-3.5m', { kind: 'agcl-chloride', minC: 0, maxC: 95, rangeSource: BATES_BOWER }],
  ['agcl-3m', { kind: 'agcl-chloride', minC: 0, maxC: 95, rangeSource: BATES_BOWER }],
  ['agcl-1m', { kind: 'agcl-chloride', minC: 0, maxC: 95, rangeSource: BATES_BOWER }],
  ['sce', CALOMEL],
  ['sce-skoog', CALOMEL],
  ['sce-bf', CALOMEL],
  ['she', { kind: 'linear', minC: TEMP_MIN_C, maxC: TEMP_MAX_C, rangeSource: 'Definition: 0 V at all temperatures' }],
]);
// Straight-line coefficients these ids carried before they followed Bates & Bower: a probe stored with
// one of them still follows the curve; any other coefficient was entered by hand and is honoured.
const EARLIER_DEFAULTS = new Map<string, number>([['agcl-3.5m', -0.00075], ['agcl-3m', -0.00075], ['agcl-1m', -0.0006]]);

/** The built-in law a probe follows: its id's, unless its coefficient was entered by hand. */
function lawOf(ref: ReferenceElectrode): Law | undefined {
  const law = LAWS.get(ref.id);
  if (law?.kind !== 'agcl-chloride') return law;
  const builtIn = REFERENCE_ELECTRODES.find((r) => r.id === ref.id)!;
  const own = ref.coeffVPerK !== builtIn.coeffVPerK && ref.coeffVPerK !== EARLIER_DEFAULTS.get(ref.id);
  return own ? { kind: 'linear', minC: 25, maxC: 25, rangeSource: 'the probe\'s own 25 °C value and coefficient' } : law;
}

// A probe entered by hand with its own value and coefficient: a straight line, valid where its maker says.
const UNKNOWN: Law = { kind: 'linear', minC: 25, maxC: 25, rangeSource: 'the probe\'s own 25 °C value and coefficient' };

/**
 * Looks up a built-in reference electrode.
 * @param id one of the ids in REFERENCE_ELECTRODES
 * @returns a copy, so callers cannot alter the shared table
 * @throws RangeError for an unknown id
 */
export function referenceById(id: string): ReferenceElectrode {
  const found = REFERENCE_ELECTRODES.find((r) => r.id === id);
  if (!found) {
    const ids = REFERENCE_ELECTRODES.map((r) => `'${r.id}'`).join(', ');
    throw new RangeError(`id must be one of ${ids} (got ${JSON.stringify(id)})`);
  }
  return { ...found };
}

/** Checks a (possibly user-entered) reference electrode's numbers. */
export function requireReference(name: string, ref: ReferenceElectrode): ReferenceElectrode {
  if (typeof ref !== 'object' || ref === null) {
    throw new RangeError(`${name} must be a ReferenceElectrode object (got ${ref === null ? 'null' : typeof ref})`);
  }
  requireInRange(`${name}.e25V`, ref.e25V, -POTENTIAL_LIMIT_V, POTENTIAL_LIMIT_V, 'V');
  requireInRange(`${name}.coeffVPerK`, ref.coeffVPerK, -TEMP_COEFF_LIMIT_V_PER_K, TEMP_COEFF_LIMIT_V_PER_K, 'V/K');
  if (ref.table !== undefined) requireTable(`${name}.table`, ref.table);
  return ref;
}

function requireTable(name: string, table: ReferenceTablePoint[]): void {
  if (!Array.isArray(table) || table.length < 2) throw new RangeError(`${name} must list at least 2 temperatures`);
  table.forEach((p, i) => {
    requireTempC(`${name}[${i}].tempC`, p?.tempC);
    requireInRange(`${name}[${i}].eV`, p?.eV, -POTENTIAL_LIMIT_V, POTENTIAL_LIMIT_V, 'V');
    if (i > 0 && !(p.tempC > table[i - 1].tempC)) throw new RangeError(`${name} temperatures must rise from row to row (row ${i})`);
  });
}

/** Linear interpolation in a maker's table; the end segments extend beyond it. */
function tableV(table: ReferenceTablePoint[], tempC: number): number {
  let i = 1;
  while (i < table.length - 1 && tempC > table[i].tempC) i++;
  const a = table[i - 1];
  const b = table[i];
  return a.eV + ((b.eV - a.eV) * (tempC - a.tempC)) / (b.tempC - a.tempC);
}

/**
 * Reference electrode potential vs SHE at the probe temperature.
 * @param ref the probe's reference electrode; its id picks the built-in temperature law
 *   (Bates & Bower's E°(T) for the KCl-strength Ag/AgCl electrodes, a straight line otherwise),
 *   anchored at the probe's own e25V; a coefficient entered by hand makes it a straight line,
 *   and a maker's table, when given, is used instead
 * @param tempC probe temperature, °C
 * @returns E_ref(T) in V vs SHE (see referenceStatus for whether tempC is inside the source's data)
 */
export function referencePotentialV(ref: ReferenceElectrode, tempC: number): number {
  requireReference('reference', ref);
  requireTempC('tempC', tempC);
  if (ref.table) return tableV(ref.table, tempC);
  if (lawOf(ref)?.kind === 'agcl-chloride') return agclChlorideV(ref.e25V, tempC);
  return ref.e25V + ref.coeffVPerK * (tempC - 25);
}

export type ReferenceRange = { minC: number; maxC: number; source: string };

/**
 * The temperatures a reference electrode's data covers. For calomel maxC is at most its
 * usable temperature. A built-in id may be given instead of an electrode.
 */
export function referenceRange(reference: ReferenceElectrode | string): ReferenceRange {
  const ref = typeof reference === 'string' ? referenceById(reference) : reference;
  if (ref.table && ref.table.length >= 2) {
    return { minC: ref.table[0].tempC, maxC: ref.table[ref.table.length - 1].tempC, source: `${ref.source} (maker's table)` };
  }
  const law = lawOf(ref) ?? UNKNOWN;
  return { minC: law.minC, maxC: Math.min(law.maxC, law.usableMaxC ?? Infinity), source: law.rangeSource };
}

/**
 * Whether a reference potential at tempC rests on its source's data.
 * @returns 'ok' inside referenceRange; 'extrapolated' outside it; 'unusable' above the
 *   electrode's usable temperature (calomel above about 70 °C)
 */
export function referenceStatus(ref: ReferenceElectrode, tempC: number): 'ok' | 'extrapolated' | 'unusable' {
  const usableMaxC = ref.table ? undefined : lawOf(ref)?.usableMaxC;
  if (usableMaxC !== undefined && tempC > usableMaxC) return 'unusable';
  const { minC, maxC } = referenceRange(ref);
  return tempC < minC - 1e-9 || tempC > maxC + 1e-9 ? 'extrapolated' : 'ok';
}
