/**
 * A deliberately small, pure model of one leach tank's iron couple, good enough for a
 * believable demo: ferric fraction f = Fe³⁺/(Fe³⁺ + Fe²⁺) moves by
 *   df/dt = oxidation·(1 − f) − consumption·f − dilution·(f − f_feed)
 * where oxidation is microbial (Train A, bioleach) or dosed oxidant under a P-controller
 * (Train B, ferric leach), consumption is ferric reduced by the sulfides being leached, and
 * dilution is fresh feed. Temperature relaxes to its target with a slow random walk.
 * A feed upset is a surge of reduced slurry (FEED_UPSET): more flow, of nearly all-ferrous
 * liquor, carrying freshly ground sulfides that reduce ferric faster than the leached solids.
 * No I/O and no clock: the caller passes dt and a random source, so tests are deterministic.
 */

export type TankKind = 'bioleach' | 'ferric';

export type TankParams = {
  kind: TankKind;
  /** Ratio Fe³⁺/Fe²⁺ the plant aims for (middle of the band). */
  targetRatio: number;
  targetTempC: number;
  /** Ferric reduced by leaching, 1/s. */
  consumptionPerS: number;
  /** Feed flow / tank volume, 1/s (1/residence time). */
  dilutionPerS: number;
  /** Ferric fraction of the incoming feed. */
  feedFraction: number;
};

export type TankState = { ferricFraction: number; tempC: number; oxidationPerS: number };

export type TankInputs = {
  /** Oxidant pump (Train B) or aeration (Train A) running. */
  oxidantOn: boolean;
  /** Feed upset: a surge of reduced slurry (FEED_UPSET). */
  feedUpset: boolean;
};

/**
 * The feed upset: six times the design feed flow (residence ~20 min instead of ~2 h) of
 * liquor that is 98 % ferrous, with fresh regrind sulfides that triple the ferric
 * consumption. Microbial oxidation cannot keep up: a bioleach tank at ratio 14 falls below 8
 * in about half a minute and settles near 4 while the surge lasts; the dosing controller of a
 * ferric leach tank rides it out inside its band. It recovers within a few minutes once the
 * feed is back to normal.
 */
export const FEED_UPSET = { flowFactor: 6, feedFraction: 0.02, consumptionFactor: 3 } as const;

/** A random number in [0, 1), e.g. Math.random. */
export type Random = () => number;

const clampFraction = (f: number) => Math.min(0.9999, Math.max(0.0001, f));
export const fractionOf = (ratio: number) => ratio / (1 + ratio);
export const ratioOf = (fraction: number) => fraction / (1 - fraction);

/** Oxidation rate that holds f at the target with normal feed: zero of df/dt solved for oxidation. */
export function steadyOxidationPerS(p: TankParams): number {
  const f = fractionOf(p.targetRatio);
  return (p.consumptionPerS * f + p.dilutionPerS * (f - p.feedFraction)) / (1 - f);
}

/** Demo defaults: residence ~2 h per tank, leaching consumes ferric on a ~20 min scale. */
export function defaultParams(kind: TankKind, targetRatio: number, targetTempC: number): TankParams {
  return { kind, targetRatio, targetTempC, consumptionPerS: 1 / 1200, dilutionPerS: 1 / 7200, feedFraction: kind === 'bioleach' ? 0.5 : 0.2 };
}

export function initialState(p: TankParams): TankState {
  return { ferricFraction: fractionOf(p.targetRatio), tempC: p.targetTempC, oxidationPerS: steadyOxidationPerS(p) };
}

/**
 * Advances a tank by dtS seconds (integrated in ≤ 5 s sub-steps, so any dt is stable).
 * @returns the new state; the input is not changed
 */
export function stepTank(state: TankState, p: TankParams, inputs: TankInputs, dtS: number, random: Random): TankState {
  let { ferricFraction: f, tempC, oxidationPerS: ox } = state;
  const steady = steadyOxidationPerS(p);
  const dilution = inputs.feedUpset ? p.dilutionPerS * FEED_UPSET.flowFactor : p.dilutionPerS;
  const feed = inputs.feedUpset ? FEED_UPSET.feedFraction : p.feedFraction;
  const consumption = inputs.feedUpset ? p.consumptionPerS * FEED_UPSET.consumptionFactor : p.consumptionPerS;
  for (let left = dtS; left > 1e-9; left -= 5) {
    const h = Math.min(5, left);
    if (!inputs.oxidantOn) {
      ox = 0;
    } else if (p.kind === 'ferric') {
      // P-control of oxidant dosing on the ferric fraction, limited to pump capacity.
      ox = Math.min(steady * 4, Math.max(0, steady + steady * 25 * (fractionOf(p.targetRatio) - f)));
    } else {
      // Microbial activity: recovers towards steady over ~10 min, wanders ±a few %, slows when cool.
      const activity = Math.exp(-(((tempC - p.targetTempC) / 8) ** 2));
      ox += ((steady * activity - ox) / 600) * h + steady * 0.02 * (random() - 0.5) * Math.sqrt(h);
      ox = Math.max(0, ox);
    }
    f = clampFraction(f + (ox * (1 - f) - consumption * f - dilution * (f - feed)) * h);
    tempC += ((p.targetTempC - tempC) / 1800) * h + 0.05 * (random() - 0.5) * Math.sqrt(h);
  }
  return { ferricFraction: f, tempC, oxidationPerS: ox };
}
