/**
 * Reference electrodes and their potential vs SHE at a given temperature.
 * Published values disagree by 2–4 mV (8–14 % in ratio), so every entry carries
 * the value chosen and its source; a probe may also carry its maker's own values.
 */
import { POTENTIAL_LIMIT_V, TEMP_COEFF_LIMIT_V_PER_K } from './constants';
import { requireInRange, requireTempC } from './guards';

export type ReferenceElectrode = {
  id: string;
  label: string;
  /** Potential vs SHE at 25 °C, V. */
  e25V: number;
  /** Temperature coefficient, V/K (linear about 25 °C). */
  coeffVPerK: number;
  source: string;
};

// Where two books differ we default to Skoog
// (Skoog, West, Holler & Crouch, Fundamentals of Analytical Chemistry), because its
// table also gives the 15/25/35 °C values from which the coefficients are computed,
// so value and coefficient come from one table. Bard & Faulkner alternatives are
// listed as separate ids so a metallurgist can pick them per probe.
export const REFERENCE_ELECTRODES: ReferenceElectrode[] = [
  {
    id: 'agcl-sat',
    label: 'Ag/AgCl, saturated KCl',
    e25V: 0.199,
    // (0.189 - 0.209) V / 20 K from the 15/25/35 °C table 0.209/0.199/0.189 V.
    coeffVPerK: -0.001,
    source: 'Skoog et al. (also Sawyer): 0.199 V; -1.0 mV/K computed from the 15/25/35 °C values 0.209/0.199/0.189 V',
  },
  {
    id: 'agcl-sat-bf',
    label: 'Ag/AgCl, saturated KCl (Bard & Faulkner)',
    e25V: 0.197,
    coeffVPerK: -0.001,
    source: 'Bard & Faulkner: 0.197 V; -1.0 mV/K computed from the Skoog 15/25/35 °C table (0.209/0.199/0.189 V)',
  },
  {
    id: 'agcl-3.5m',
    label: 'Ag/AgCl, 3.5 M KCl',
    e25V: 0.205,
    // (0.197 - 0.212) V / 20 K from the 15/25/35 °C table 0.212/0.205/0.197 V.
    coeffVPerK: -0.00075,
    source: 'Skoog et al.: 0.205 V; -0.75 mV/K computed from the 15/25/35 °C values 0.212/0.205/0.197 V',
  },
  {
    id: 'agcl-3m',
    label: 'Ag/AgCl, 3 M KCl',
    e25V: 0.21,
    // No sourced coefficient for 3 M: the nearest tabulated concentration (3.5 M)
    // is used as an approximation. Probe makers quote their own; prefer theirs.
    coeffVPerK: -0.00075,
    source:
      'Published tables: 0.210 V (others give 0.207 V); -0.75 mV/K approximated from the 3.5 M KCl column, unverified for 3 M — enter the probe maker\'s value where known',
  },
  {
    id: 'agcl-1m',
    label: 'Ag/AgCl, 1 M KCl',
    e25V: 0.236,
    // No sourced coefficient; -0.6 mV/K is from memory (close to the AgCl/Ag
    // standard electrode's own coefficient) and must be confirmed before relying on it.
    coeffVPerK: -0.0006,
    source: 'Published tables: 0.236 V; the temperature coefficient is unconfirmed — enter the probe maker\'s value where known',
  },
  {
    id: 'sce',
    label: 'Saturated calomel (SCE)',
    e25V: 0.2444,
    coeffVPerK: -0.00067,
    source: 'Skoog et al.: 0.2444 V (Bard & Faulkner give 0.2412 V); about -0.67 mV/K calculated from tabulated values',
  },
  {
    id: 'sce-bf',
    label: 'Saturated calomel (SCE, Bard & Faulkner)',
    e25V: 0.2412,
    coeffVPerK: -0.00067,
    source: 'Bard & Faulkner: 0.2412 V; about -0.67 mV/K calculated from tabulated values',
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
  return ref;
}

/**
 * Reference electrode potential vs SHE at the probe temperature.
 * @param ref the probe's reference electrode (e25V in V, coeffVPerK in V/K)
 * @param tempC probe temperature, °C
 * @returns E_ref(T) in V vs SHE = e25V + coeffVPerK·(tempC − 25)
 */
export function referencePotentialV(ref: ReferenceElectrode, tempC: number): number {
  requireReference('reference', ref);
  requireTempC('tempC', tempC);
  return ref.e25V + ref.coeffVPerK * (tempC - 25);
}
