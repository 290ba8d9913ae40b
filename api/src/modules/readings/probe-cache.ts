import type { ReferenceElectrode } from '../../../../shared/redox/index.ts';
import type { Pool } from '../../db/pool.ts';

/** Everything the worker needs to convert one probe's readings. */
export type ProbeEntry = {
  probeId: number;
  probeTag: string;
  tankId: number;
  siteTag: string;
  reference: ReferenceElectrode;
  /** The tank's calibration with the highest version; null when the tank has none. */
  calibration: { version: number; formalPotentialV: number; formalCoeffVPerK: number } | null;
};

/** What the pipeline asks of a cache; tests pass a plain object. */
export type ProbeLookup = { probe(tag: string): ProbeEntry | undefined; hasSite(tag: string): boolean };

type Row = {
  probe_id: number; probe_tag: string; tank_id: number; site_tag: string; reference_id: string;
  reference_e25_v: number; reference_coeff_v_per_k: number;
  version: number | null; formal_potential_v: number | null; formal_coeff_v_per_k: number | null;
};

const PROBES_SQL = `
  SELECT p.id AS probe_id, p.tag AS probe_tag, p.tank_id, s.tag AS site_tag, p.reference_id,
         p.reference_e25_v, p.reference_coeff_v_per_k, c.version, c.formal_potential_v, c.formal_coeff_v_per_k
    FROM probes p
    JOIN tanks t ON t.id = p.tank_id
    JOIN circuits ci ON ci.id = t.circuit_id
    JOIN sites s ON s.id = ci.site_id
    LEFT JOIN calibrations c ON c.tank_id = t.id
     AND c.version = (SELECT MAX(c2.version) FROM calibrations c2 WHERE c2.tank_id = t.id)`;

/** Builds a lookup from query rows (exported for tests and the API's historical import). */
export function buildLookup(rows: Row[], siteTags: string[]): ProbeLookup {
  const probes = new Map<string, ProbeEntry>();
  for (const r of rows) {
    probes.set(r.probe_tag, {
      probeId: r.probe_id, probeTag: r.probe_tag, tankId: r.tank_id, siteTag: r.site_tag,
      reference: { id: r.reference_id, label: r.reference_id, e25V: r.reference_e25_v, coeffVPerK: r.reference_coeff_v_per_k, source: `probe ${r.probe_tag}` },
      calibration: r.version === null ? null : {
        version: r.version, formalPotentialV: r.formal_potential_v!, formalCoeffVPerK: r.formal_coeff_v_per_k ?? 0,
      },
    });
  }
  const sites = new Set(siteTags);
  return { probe: (tag) => probes.get(tag), hasSite: (tag) => sites.has(tag) };
}

/**
 * Probe tag → probe, tank, site, reference electrode and latest calibration. Refreshed on a
 * timer, on demand when the API announces a calibration change, and when an unknown probe
 * shows up (a probe added minutes ago should not be dead-lettered for up to 10 s).
 */
export class ProbeCache implements ProbeLookup {
  private lookup: ProbeLookup = buildLookup([], []);
  private loadedAtMs = 0;
  private loading: Promise<void> | null = null;

  constructor(private readonly pool: Pool, private readonly minReloadGapMs = 1_000) {}

  probe(tag: string): ProbeEntry | undefined {
    return this.lookup.probe(tag);
  }

  hasSite(tag: string): boolean {
    return this.lookup.hasSite(tag);
  }

  /** Reloads from the database; concurrent callers share one query. */
  reload(): Promise<void> {
    this.loading ??= (async () => {
      try {
        const rows: Row[] = await this.pool.query(PROBES_SQL);
        const sites: { tag: string }[] = await this.pool.query('SELECT tag FROM sites');
        this.lookup = buildLookup(rows, sites.map((s) => s.tag));
        this.loadedAtMs = Date.now();
      } finally {
        this.loading = null;
      }
    })();
    return this.loading;
  }

  /**
   * Waits for a reload in progress (so readings that arrive after a calibration change use it),
   * and reloads when some tags are unknown, at most once per minReloadGapMs.
   */
  async ensure(tags: Iterable<string>): Promise<void> {
    if (this.loading) await this.loading.catch(() => undefined);
    for (const tag of tags) {
      if (!this.lookup.probe(tag) && Date.now() - this.loadedAtMs >= this.minReloadGapMs) {
        await this.reload();
        return;
      }
    }
  }
}
