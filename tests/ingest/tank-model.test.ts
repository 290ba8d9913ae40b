import { describe, expect, it } from 'vitest';
import { FaultBoard } from '../../simulators/plant/faults.ts';
import { defaultParams, initialState, ratioOf, stepTank, type TankInputs, type TankParams } from '../../simulators/plant/tank-model.ts';

/** Deterministic random source (mulberry32). */
function seeded(seed: number): () => number {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function run(p: TankParams, seconds: number, inputs: TankInputs, seed = 1) {
  const random = seeded(seed);
  let s = initialState(p);
  const ratios: number[] = [];
  const temps: number[] = [];
  for (let t = 0; t < seconds; t += 5) {
    s = stepTank(s, p, inputs, 5, random);
    ratios.push(ratioOf(s.ferricFraction));
    temps.push(s.tempC);
  }
  return { ratios, temps, last: ratioOf(s.ferricFraction) };
}

const normal = { oxidantOn: true, feedUpset: false };
const bioleach = defaultParams('bioleach', 14, 43); // Train A: band 8–25, 40–45 °C
const ferric = defaultParams('ferric', 1, 80); // Train B: band 0.5–2, 75–85 °C

describe('tank model', () => {
  it('when a bioleach tank runs undisturbed for 6 h, then its ratio stays inside the 8–25 band and its temperature near 43 °C', () => {
    const { ratios, temps } = run(bioleach, 6 * 3600, normal);
    expect(Math.min(...ratios)).toBeGreaterThan(8);
    expect(Math.max(...ratios)).toBeLessThan(25);
    expect(Math.min(...temps)).toBeGreaterThan(40);
    expect(Math.max(...temps)).toBeLessThan(46);
  });

  it('when a ferric tank runs undisturbed, then the controller holds the ratio inside 0.5–2', () => {
    const { ratios } = run(ferric, 6 * 3600, normal);
    expect(Math.min(...ratios)).toBeGreaterThan(0.5);
    expect(Math.max(...ratios)).toBeLessThan(2);
  });

  it('when the oxidant pump trips, then the ratio decays below the band within 30 min', () => {
    expect(run(ferric, 1800, { oxidantOn: false, feedUpset: false }).last).toBeLessThan(0.5);
  });

  it('when the feed is upset, then the bioleach ratio drops below the band', () => {
    expect(run(bioleach, 3600, { oxidantOn: true, feedUpset: true }).last).toBeLessThan(8);
  });

  it('when the same seed is used twice, then the run is identical', () => {
    expect(run(bioleach, 3600, normal, 7).ratios).toEqual(run(bioleach, 3600, normal, 7).ratios);
  });

  it('when a probe flat-lines, fouls or is noisy, then its mV is stuck, drifts down, or scatters', () => {
    const board = new FaultBoard();
    const r = seeded(3);
    const t0 = 1_000_000;
    const before = board.probeMv('A1', 500, t0, r);
    expect(Math.abs(before - 500)).toBeLessThanOrEqual(1.5);
    board.apply({ fault: 'flatline', probeTag: 'A1', action: 'start' }, t0);
    expect(board.probeMv('A1', 450, t0 + 5_000, r)).toBe(before);
    board.apply({ fault: 'flatline', probeTag: 'A1', action: 'clear' }, t0);
    board.apply({ fault: 'fouling', probeTag: 'A1', action: 'start' }, t0);
    expect(board.probeMv('A1', 500, t0 + 30 * 60_000, r)).toBeLessThan(472);
    board.apply({ fault: 'clear', probeTag: 'A1', action: 'start' }, t0);
    expect(board.list()).toEqual([]);
  });
});
