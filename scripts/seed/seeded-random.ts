/**
 * Deterministic random numbers for the demo history, so every fresh start tells the same
 * story (and the test can rely on it): mulberry32, seeded from a text such as a tank tag.
 */
export type Rng = {
  /** Uniform in [0, 1), the shape the tank model's `Random` expects. */
  next: () => number;
  /** Normal with mean 0 and the given standard deviation (Box–Muller). */
  normal: (sd: number) => number;
  /** Uniform in [lo, hi). */
  between: (lo: number, hi: number) => number;
  pick: <T>(items: readonly T[]) => T;
};

function hashSeed(text: string): number {
  let h = 2166136261;
  for (const ch of text) h = Math.imul(h ^ ch.charCodeAt(0), 16777619);
  return h >>> 0;
}

export function seededRng(seed: string): Rng {
  let a = hashSeed(seed);
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = (sd: number) => {
    const u = 1 - next();
    return sd * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * next());
  };
  return {
    next,
    normal,
    between: (lo, hi) => lo + (hi - lo) * next(),
    pick: (items) => items[Math.floor(next() * items.length)],
  };
}
