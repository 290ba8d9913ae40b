/**
 * Circuit templates: the alarm definitions a new tank gets, with their rationalisation.
 * Thresholds here are starting values for the invented demo plant, not
 * recommendations: bands and limits are site settings and are edited per tank
 * with a recorded reason. Priorities keep high-priority alarms few, after the priority-mix target
 * of ISA-18.2 (about 5 % high, 15 % medium, 80 % low).
 */
import type { DefinitionSettings } from '../schemas/alarms.ts';

export type CircuitTemplate = { id: string; name: string; description: string; definitions: DefinitionSettings[] };

type Limits = { orpLowMv: number; orpHighMv: number; tempLowC: number; tempHighC: number };

function definitions(l: Limits, medium: string): DefinitionSettings[] {
  const probe = 'Probe fouled, reference electrode drying out or depleted, cable or transmitter fault';
  return [
    { kind: 'ratio-below-band', priority: 1, threshold: null, deadband: 5, onDelayS: 30, offDelayS: 30, windowS: null, rationalisation: {
      cause: `Oxidant supply lost or short (air, peroxide), ${medium} activity falling, feed surge of ferrous iron`,
      consequence: 'Leach rate falls; metal recovery is lost for every hour below band',
      action: 'Check oxidant flow and blower or dosing pump; compare with the tank upstream; take a sample for titration if in doubt',
      responseMin: 10 } },
    { kind: 'ratio-above-band', priority: 2, threshold: null, deadband: 5, onDelayS: 60, offDelayS: 30, windowS: null, rationalisation: {
      cause: 'Oxidant overdosed or feed rate dropped',
      consequence: 'Oxidant wasted; some sulfides passivate; risk of iron precipitating as jarosite',
      action: 'Trim oxidant dosing; confirm the feed rate; check the band is the one intended',
      responseMin: 30 } },
    { kind: 'orp-low', priority: 2, threshold: l.orpLowMv, deadband: 5, onDelayS: 30, offDelayS: 30, windowS: null, rationalisation: {
      cause: 'Potential far below the working window: oxidant loss or a probe fault', consequence: 'Leaching stalls if real; a probe fault hides the real state',
      action: 'Compare with neighbouring tanks and the ratio alarm; check the probe if the tank looks normal', responseMin: 15 } },
    { kind: 'orp-high', priority: 2, threshold: l.orpHighMv, deadband: 5, onDelayS: 30, offDelayS: 30, windowS: null, rationalisation: {
      cause: 'Potential far above the working window: overdosing or a probe fault', consequence: 'Passivation and wasted oxidant if real',
      action: 'Check dosing set points and the probe', responseMin: 15 } },
    { kind: 'temp-low', priority: 2, threshold: l.tempLowC, deadband: 0.5, onDelayS: 120, offDelayS: 60, windowS: null, rationalisation: {
      cause: 'Heating or cooling control fault, cold feed', consequence: 'Slower leaching; the ratio conversion uses this temperature',
      action: 'Check the heat exchanger and the temperature transmitter', responseMin: 30 } },
    { kind: 'temp-high', priority: 2, threshold: l.tempHighC, deadband: 0.5, onDelayS: 120, offDelayS: 60, windowS: null, rationalisation: {
      cause: 'Cooling failure or runaway reaction heat', consequence: `Damage to the ${medium} and to equipment; more acid mist`,
      action: 'Check cooling water and the temperature transmitter; follow the site procedure for hot slurry', responseMin: 15 } },
    { kind: 'orp-rate', priority: 2, threshold: 15, deadband: 3, onDelayS: 0, offDelayS: 60, windowS: 120, rationalisation: {
      cause: 'Oxidant pump trip or start, feed upset, probe failing', consequence: 'The ratio will leave the band within minutes',
      action: 'Look at the trend and the dosing equipment now', responseMin: 10 } },
    { kind: 'stale', priority: 2, threshold: 12, deadband: 0, onDelayS: 0, offDelayS: 0, windowS: null, rationalisation: {
      cause: 'Probe transmitter, network or gateway down', consequence: 'The tank is not being watched',
      action: 'Check the transmitter and network; read the tank by hand until it is back', responseMin: 15 } },
    { kind: 'probe-flatline', priority: 3, threshold: 0.5, deadband: 0.5, onDelayS: 0, offDelayS: 60, windowS: 600, rationalisation: {
      cause: probe, consequence: 'A frozen value looks normal while the tank may not be',
      action: 'Check the probe against a standard solution; clean the platinum', responseMin: 120 } },
    { kind: 'probe-noisy', priority: 3, threshold: 25, deadband: 5, onDelayS: 60, offDelayS: 120, windowS: 120, rationalisation: {
      cause: 'Poor earthing, gas bubbles on the electrode, failing reference junction', consequence: 'The ratio jumps about; dosing decisions become guesswork',
      action: 'Check earthing and the junction; compare with a hand-held meter', responseMin: 240 } },
    { kind: 'calibration-drift', priority: 3, threshold: 10, deadband: 2, onDelayS: 0, offDelayS: 0, windowS: null, rationalisation: {
      cause: 'Probe drift or fouling since the last calibration, or an assay problem', consequence: 'The live ratio is off by a factor of 1.5 or more',
      action: 'Check the probe against a standard solution; repeat the assay; recalibrate on Calibration', responseMin: 480 } },
    { kind: 'probe-check-overdue', priority: 3, threshold: 0, deadband: 0, onDelayS: 0, offDelayS: 0, windowS: null, rationalisation: {
      cause: 'The scheduled check against a standard solution was not recorded', consequence: 'Drift can go unnoticed',
      action: 'Check the probe against ZoBell or Light solution and record it on Calibration', responseMin: 1440 } },
  ];
}

export const CIRCUIT_TEMPLATES: CircuitTemplate[] = [
  {
    id: 'mesophilic-bioleach', name: 'Mesophilic tank bioleach',
    description: 'Bioleach tanks near 40–46 °C, Pt against Ag/AgCl',
    definitions: definitions({ orpLowMv: 480, orpHighMv: 680, tempLowC: 36, tempHighC: 48 }, 'microbial culture'),
  },
  {
    id: 'hot-ferric-leach', name: 'Hot ferric leach',
    description: 'Ferric leach tanks near 75–85 °C in a low-potential window',
    definitions: definitions({ orpLowMv: 460, orpHighMv: 660, tempLowC: 70, tempHighC: 90 }, 'leach liquor'),
  },
];

export const templateById = (id: string): CircuitTemplate | undefined => CIRCUIT_TEMPLATES.find((t) => t.id === id);
