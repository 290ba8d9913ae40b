import mariadb from 'mariadb';
import type { ReferenceElectrode } from '../../shared/redox/index.ts';
import { DEMO_CIRCUITS } from '../../scripts/seed/demo-plant.ts';
import { defaultParams, type TankKind, type TankParams } from './tank-model.ts';

/** One simulated probe with the chemistry it obeys (frozen at start: recalibrating the tank changes the display, not the truth). */
export type SimProbe = {
  probeTag: string;
  tankTag: string;
  intervalS: number;
  reference: ReferenceElectrode;
  formalPotentialV: number;
  formalCoeffVPerK: number;
  params: TankParams;
};

type Row = {
  probe_tag: string; reference_id: string; reference_e25_v: number; reference_coeff_v_per_k: number; interval_s: number;
  tank_tag: string; position: number; band_low: number; band_high: number; band_target: number | null;
  formal_potential_v: number | null; formal_coeff_v_per_k: number | null;
};

const FALLBACK_FORMAL_V = 0.68; // Skoog, formal potential in 1 M H2SO4; only when a tank has no calibration yet

/** Train B of the demo runs a low-potential window (band ≤ 5); everything else is treated as bioleach. */
export function tankKind(bandHigh: number): TankKind {
  return bandHigh <= 5 ? 'ferric' : 'bioleach';
}

function tankTempC(tankTag: string, kind: TankKind, position: number): number {
  const demo = DEMO_CIRCUITS.flatMap((c) => c.tanks).find((t) => t.tag === tankTag);
  if (demo) return demo.tempC;
  return kind === 'bioleach' ? 40 + Math.min(position + 1, 5) : 75 + (position + 1) * 2.5;
}

/** Reads the site's active probes, their tanks, bands and latest calibrations. */
export async function loadSimProbes(databaseUrl: string, siteTag: string): Promise<SimProbe[]> {
  const url = new URL(databaseUrl);
  const conn = await mariadb.createConnection({
    host: url.hostname, port: Number(url.port || 3306), user: decodeURIComponent(url.username),
    password: decodeURIComponent(url.password), database: url.pathname.slice(1), connectTimeout: 10_000,
  });
  try {
    const rows: Row[] = await conn.query(
      `SELECT p.tag AS probe_tag, p.reference_id, p.reference_e25_v, p.reference_coeff_v_per_k, p.interval_s,
              t.tag AS tank_tag, t.position, t.band_low, t.band_high, t.band_target, c.formal_potential_v, c.formal_coeff_v_per_k
         FROM probes p
         JOIN tanks t ON t.id = p.tank_id
         JOIN circuits ci ON ci.id = t.circuit_id
         JOIN sites s ON s.id = ci.site_id
         LEFT JOIN calibrations c ON c.tank_id = t.id AND c.version = (SELECT MAX(version) FROM calibrations WHERE tank_id = t.id)
        WHERE s.tag = ? AND p.active = 1 AND t.offline = 0
        ORDER BY ci.position, t.position`, [siteTag]);
    return rows.map((r) => {
      const kind = tankKind(r.band_high);
      const target = r.band_target ?? Math.sqrt(r.band_low * r.band_high);
      return {
        probeTag: r.probe_tag, tankTag: r.tank_tag, intervalS: r.interval_s,
        reference: { id: r.reference_id, label: r.reference_id, e25V: r.reference_e25_v, coeffVPerK: r.reference_coeff_v_per_k, source: 'probes table' },
        formalPotentialV: r.formal_potential_v ?? FALLBACK_FORMAL_V,
        formalCoeffVPerK: r.formal_coeff_v_per_k ?? 0,
        params: defaultParams(kind, target, tankTempC(r.tank_tag, kind, r.position)),
      };
    });
  } finally {
    await conn.end();
  }
}
