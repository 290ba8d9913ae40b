import { describe, it, expect } from 'vitest';
import {
  fitFormalPotential,
  formalPotentialAtV,
  ironSplit,
  log10Ratio,
  mvPerDecade,
  nernstSlopeV,
  orpToRatio,
  oxidantDemand,
  probeCheck,
  ratioToOrpMv,
  ratioUncertainty,
  referenceById,
  referencePotentialV,
  standardPotentialV,
  type ReferenceElectrode,
} from '../../shared/redox';

// Guards: non-finite numbers, temperatures outside the range, Fe2+ = 0 or > total Fe
// must give a clear error, never Infinity or NaN.
const ref = referenceById('agcl-sat');
const conditions = { tempC: 25, reference: ref, formalPotentialV: 0.68 };
const check = { standard: 'zobell' as const, tempC: 25, reference: ref, readingMv: 230, toleranceMv: 10 };
const dose = { volumeM3: 500, totalFeGPerL: 20, ratioNow: 1, ratioTarget: 3, oxidant: 'h2o2' as const, utilisation: 0.8 };
const badRef = (patch: Partial<ReferenceElectrode>) => ({ ...ref, ...patch });
const assays = [
  { orpMv: 480, tempC: 40, fe2: 5, feTotal: 10 },
  { orpMv: 510, tempC: 50, fe2: 3, feTotal: 10 },
];

// [what, call, pattern the message must contain: the argument name and its allowed range]
const cases: Array<[string, () => unknown, RegExp]> = [
  ['nernstSlopeV tempC NaN', () => nernstSlopeV(NaN), /tempC must be a finite number in \[-10, 150\] °C \(got NaN\)/],
  ['nernstSlopeV tempC Infinity', () => nernstSlopeV(Infinity), /tempC .*\[-10, 150\]/],
  ['nernstSlopeV tempC -10.1', () => nernstSlopeV(-10.1), /tempC .*\[-10, 150\]/],
  ['nernstSlopeV tempC 150.1', () => nernstSlopeV(150.1), /tempC .*\[-10, 150\]/],
  ['nernstSlopeV n 0', () => nernstSlopeV(25, 0), /n must be a positive integer/],
  ['nernstSlopeV n 1.5', () => nernstSlopeV(25, 1.5), /n must be a positive integer/],
  ['nernstSlopeV n -1', () => nernstSlopeV(25, -1), /n must be a positive integer/],
  ['mvPerDecade n NaN', () => mvPerDecade(25, NaN), /n must be a positive integer/],
  ['referencePotentialV tempC 200', () => referencePotentialV(ref, 200), /tempC .*\[-10, 150\]/],
  ['referencePotentialV e25V NaN', () => referencePotentialV(badRef({ e25V: NaN }), 25), /reference\.e25V must be a finite number in \[-5, 5\] V/],
  ['referencePotentialV coeff 1 V/K', () => referencePotentialV(badRef({ coeffVPerK: 1 }), 25), /reference\.coeffVPerK .*\[-0\.01, 0\.01\] V\/K/],
  ['formalPotentialAtV NaN', () => formalPotentialAtV(NaN, 25), /formalPotentialV .*\[-5, 5\] V/],
  ['orpToRatio orpMv NaN', () => orpToRatio({ ...conditions, orpMv: NaN }), /orpMv must be a finite number in \[-5000, 5000\] mV/],
  ['orpToRatio orpMv -Infinity', () => orpToRatio({ ...conditions, orpMv: -Infinity }), /orpMv .*\[-5000, 5000\]/],
  ['orpToRatio orpMv 6000', () => orpToRatio({ ...conditions, orpMv: 6000 }), /orpMv .*\[-5000, 5000\]/],
  ['orpToRatio tempC -20', () => orpToRatio({ ...conditions, tempC: -20, orpMv: 400 }), /tempC .*\[-10, 150\]/],
  ['orpToRatio formalPotentialV Infinity', () => orpToRatio({ ...conditions, formalPotentialV: Infinity, orpMv: 400 }), /formalPotentialV .*\[-5, 5\]/],
  ['orpToRatio formalCoeffVPerK NaN', () => orpToRatio({ ...conditions, formalCoeffVPerK: NaN, orpMv: 400 }), /formalCoeffVPerK .*\[-0\.01, 0\.01\]/],
  ['orpToRatio reference null', () => orpToRatio({ ...conditions, reference: null as unknown as ReferenceElectrode, orpMv: 400 }), /reference must be a ReferenceElectrode/],
  ['ratioToOrpMv ratio 0', () => ratioToOrpMv({ ...conditions, ratio: 0 }), /ratio must be a finite number in \(0, finite\]/],
  ['ratioToOrpMv ratio -1', () => ratioToOrpMv({ ...conditions, ratio: -1 }), /ratio .*\(0, finite\]/],
  ['ratioToOrpMv ratio Infinity', () => ratioToOrpMv({ ...conditions, ratio: Infinity }), /ratio .*\(0, finite\]/],
  ['ratioToOrpMv tempC NaN', () => ratioToOrpMv({ ...conditions, tempC: NaN, ratio: 2 }), /tempC .*\[-10, 150\]/],
  ['ironSplit ratio 0', () => ironSplit(0, 10), /ratio .*\(0, finite\]/],
  ['ironSplit ratio NaN', () => ironSplit(NaN, 10), /ratio .*\(0, finite\]/],
  ['ironSplit totalFe -1', () => ironSplit(3, -1), /totalFe must be a finite number ≥ 0/],
  ['ironSplit totalFe Infinity', () => ironSplit(3, Infinity), /totalFe must be a finite number ≥ 0/],
  ['log10Ratio ratio 0', () => log10Ratio(0), /ratio .*\(0, finite\]/],
  ['ratioUncertainty tolerance 0', () => ratioUncertainty({ tempC: 25, toleranceMv: 0 }), /toleranceMv must be a finite number in \(0, 1000\] mV/],
  ['ratioUncertainty tolerance NaN', () => ratioUncertainty({ tempC: 25, toleranceMv: NaN }), /toleranceMv .*\(0, 1000\]/],
  ['ratioUncertainty tempC 151', () => ratioUncertainty({ tempC: 151, toleranceMv: 10 }), /tempC .*\[-10, 150\]/],
  ['fitFormalPotential samples not an array', () => fitFormalPotential(null as unknown as [], { reference: ref }), /samples must be an array/],
  ['fitFormalPotential bad reference', () => fitFormalPotential(assays, { reference: badRef({ e25V: Infinity }) }), /options\.reference\.e25V/],
  ['fitFormalPotential fe2 = 0', () => fitFormalPotential([assays[0], { ...assays[1], fe2: 0 }], { reference: ref }), /samples\[1\]\.fe2 .*\(0, feTotal\)/],
  ['fitFormalPotential fe2 > feTotal', () => fitFormalPotential([{ ...assays[0], fe2: 11 }, assays[1]], { reference: ref }), /samples\[0\]\.fe2/],
  ['probeCheck readingMv NaN', () => probeCheck({ ...check, readingMv: NaN }), /readingMv .*\[-5000, 5000\] mV/],
  ['probeCheck toleranceMv 0', () => probeCheck({ ...check, toleranceMv: 0 }), /toleranceMv .*\(0, 1000\] mV/],
  ['probeCheck toleranceMv -5', () => probeCheck({ ...check, toleranceMv: -5 }), /toleranceMv .*\(0, 1000\]/],
  ['probeCheck unknown standard', () => probeCheck({ ...check, standard: 'quinhydrone' as 'zobell' }), /standard must be one of 'zobell', 'light'/],
  ['probeCheck tempC NaN', () => probeCheck({ ...check, tempC: NaN }), /tempC .*\[1, 30\]/],
  ['standardPotentialV light at 40 °C', () => standardPotentialV('light', 40), /tempC .*\[20, 30\]/],
  ['oxidantDemand volume -1', () => oxidantDemand({ ...dose, volumeM3: -1 }), /volumeM3 must be a finite number in \[0, 10000000\] m³/],
  ['oxidantDemand volume NaN', () => oxidantDemand({ ...dose, volumeM3: NaN }), /volumeM3 .*\[0, 10000000\]/],
  ['oxidantDemand total Fe -0.1', () => oxidantDemand({ ...dose, totalFeGPerL: -0.1 }), /totalFeGPerL .*\[0, 1000\] g\/L/],
  ['oxidantDemand ratioNow 0', () => oxidantDemand({ ...dose, ratioNow: 0 }), /ratioNow .*\(0, finite\]/],
  ['oxidantDemand ratioTarget -2', () => oxidantDemand({ ...dose, ratioTarget: -2 }), /ratioTarget .*\(0, finite\]/],
  ['oxidantDemand utilisation 0', () => oxidantDemand({ ...dose, utilisation: 0 }), /utilisation must be a finite number in \(0, 1\]/],
  ['oxidantDemand utilisation 1.2', () => oxidantDemand({ ...dose, utilisation: 1.2 }), /utilisation .*\(0, 1\]/],
  ['oxidantDemand utilisation 1e-320', () => oxidantDemand({ ...dose, utilisation: 1e-320 }), /utilisation .*\(0, 1\]/],
  ['oxidantDemand unknown oxidant', () => oxidantDemand({ ...dose, oxidant: 'cl2' as 'o2' }), /oxidant must be one of 'h2o2', 'mno2', 'o2'/],
];

describe('argument guards', () => {
  it.each(cases)('when %s, then a RangeError names the argument and its allowed range', (_what, call, message) => {
    expect(call).toThrow(RangeError);
    expect(call).toThrow(message);
  });

  it('when a non-number sneaks in from untyped JSON, then it is rejected rather than coerced', () => {
    expect(() => nernstSlopeV('25' as unknown as number)).toThrow(/tempC .*\(got "25"\)/);
  });
});
