/**
 * The week of readings, played by the simulator's own tank model (simulators/plant): same
 * dynamics, same probe noise, same truth-to-mV chemistry, one minute apart. Pure: the story
 * and a seeded random source decide everything, so every fresh start has the same week.
 */
import { ratioToOrpMv } from '../../shared/redox/index.ts';
import { FaultBoard } from '../../simulators/plant/faults.ts';
import type { SimProbe } from '../../simulators/plant/plant-db.ts';
import { initialState, ratioOf, stepTank } from '../../simulators/plant/tank-model.ts';
import { driftMv, HOUR_MS, inCleaningGap, MINUTE_MS, type DemoStory } from './demo-story.ts';
import { seededRng } from './seeded-random.ts';

export type HistoryPoint = {
  tsMs: number;
  /** What the probe reported (noise, and B2's fouling, included). */
  orpMv: number;
  tempC: number;
  /** The model's true Fe³⁺/Fe²⁺, for the lab assays. */
  trueRatio: number;
};

export type ProbeHistory = { probe: SimProbe; points: HistoryPoint[] };

/** Hours the model runs before the first stored minute, so the week opens on a settled plant. */
const WARM_UP_H = 12;

export function generateProbeHistory(probe: SimProbe, story: DemoStory): ProbeHistory {
  const rng = seededRng(`kestrel-history/${probe.tankTag}`);
  const board = new FaultBoard();
  const p = probe.params;
  let state = initialState(p);
  for (let t = story.startMs - WARM_UP_H * HOUR_MS; t < story.startMs; t += MINUTE_MS) {
    state = stepTank(state, p, { oxidantOn: true, feedUpset: false }, 60, rng.next);
  }
  const points: HistoryPoint[] = [];
  const upset = story.upset.tankTag === probe.tankTag ? story.upset : null;
  for (let t = story.startMs; t < story.endMs; t += MINUTE_MS) {
    const feedUpset = upset !== null && t >= upset.fromMs && t < upset.toMs;
    state = stepTank(state, p, { oxidantOn: true, feedUpset }, 60, rng.next);
    const trueRatio = ratioOf(state.ferricFraction);
    // Noise is drawn even while the probe is out, so the rest of the week does not shift.
    const trueMv = ratioToOrpMv({
      ratio: trueRatio, tempC: state.tempC, reference: probe.reference,
      formalPotentialV: probe.formalPotentialV, formalCoeffVPerK: probe.formalCoeffVPerK,
    });
    const reported = board.probeMv(probe.probeTag, trueMv, t, rng.next) + driftMv(story, probe.probeTag, t);
    if (inCleaningGap(story, probe.probeTag, t)) continue;
    points.push({ tsMs: t, orpMv: Math.round(reported * 10) / 10, tempC: Math.round(state.tempC * 100) / 100, trueRatio });
  }
  return { probe, points };
}

export const generateHistory = (probes: SimProbe[], story: DemoStory): ProbeHistory[] =>
  probes.map((p) => generateProbeHistory(p, story));
