/**
 * "Kestrel Flats", an invented plant for the demo: every name, number and person here is made up.
 * Train A: six mesophilic bioleach tanks in series, Pt vs Ag/AgCl (3 M KCl), band 8–25.
 * Train B: four hot ferric leach tanks in a low-potential window, band 0.5–2.
 */
export type DemoTank = { tag: string; name: string; volumeM3: number; band: [number, number, number]; tempC: number };
export type DemoCircuit = { tag: string; name: string; process: 'bioleach' | 'ferric-leach'; formalPotentialV: number; formalCoeffVPerK: number; tanks: DemoTank[] };

export const DEMO_SITE = { tag: 'kestrel', name: 'Kestrel Flats', timeZone: 'Australia/Perth' };
export const DEMO_DEVICE = { username: 'sim-kestrel' };

export const DEMO_CIRCUITS: DemoCircuit[] = [
  {
    tag: 'A', name: 'Train A · bioleach', process: 'bioleach', formalPotentialV: 0.684, formalCoeffVPerK: 0.0009,
    tanks: [1, 2, 3, 4, 5, 6].map((i) => ({
      tag: `A${i}`, name: `Bioleach ${i}`, volumeM3: i <= 2 ? 420 : 360, band: [8, 25, 14], tempC: 40 + Math.min(i, 5),
    })),
  },
  {
    tag: 'B', name: 'Train B · ferric leach', process: 'ferric-leach', formalPotentialV: 0.671, formalCoeffVPerK: 0.0011,
    tanks: [1, 2, 3, 4].map((i) => ({
      tag: `B${i}`, name: `Ferric leach ${i}`, volumeM3: 180, band: [0.5, 2, 1], tempC: 75 + i * 2.5,
    })),
  },
];
