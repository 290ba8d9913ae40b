import type { ReferenceElectrode, ReferenceTablePoint } from '../../../../shared/redox/index.ts';
import type { Pool } from '../../db/pool.ts';
import { lookupsRepository, type ProbeRow } from './lookups.repository.ts';
import { CalibrationHistory } from './calibration-history.ts';

/** Everything the worker needs to convert one probe's readings. */
export type ProbeEntry = {
  probeId: number;
  probeTag: string;
  tankId: number;
  siteTag: string;
  reference: ReferenceElectrode;
  /** The probe failed its last check and has neither passed one nor been replaced since. */
  suspect: boolean;
  /** The tank's calibration with the highest version; null when the tank has none. */
  calibration: { version: number; formalPotentialV: number; formalCoeffVPerK: number; slopeEfficiency: number } | null;
};

/**
 * What the pipeline asks of a cache; tests pass a plain object. calibrationAt, when given,
 * answers the calibration valid at a reading's own time (a late or backlog reading must not
 * get a calibration that took effect after it was taken); null falls back to the newest.
 */
export type ProbeLookup = {
  probe(tag: string): ProbeEntry | undefined;
  hasSite(tag: string): boolean;
  calibrationAt?(tankId: number, tsMs: number): ProbeEntry['calibration'];
};

/** A maker's table stored as JSON (MariaDB returns JSON columns as text). */
export function referenceTableOf(raw: string | ReferenceTablePoint[] | null | undefined): { table?: ReferenceTablePoint[] } {
  if (raw === null || raw === undefined) return {};
  const table = typeof raw === 'string' ? (JSON.parse(raw) as ReferenceTablePoint[]) : raw;
  return Array.isArray(table) && table.length >= 2 ? { table } : {};
}

/** Builds a lookup from query rows (exported for tests and the API's historical import). */
export function buildLookup(rows: ProbeRow[], siteTags: string[]): ProbeLookup {
  const probes = new Map<string, ProbeEntry>();
  for (const r of rows) {
    probes.set(r.probe_tag, {
      probeId: r.probe_id, probeTag: r.probe_tag, tankId: r.tank_id, siteTag: r.site_tag, suspect: Boolean(r.suspect),
      reference: {
        id: r.reference_id, label: r.reference_id, e25V: r.reference_e25_v, coeffVPerK: r.reference_coeff_v_per_k, source: `probe ${r.probe_tag}`,
        ...referenceTableOf(r.reference_table),
      },
      calibration: r.version === null ? null : {
        version: r.version, formalPotentialV: r.formal_potential_v!, formalCoeffVPerK: r.formal_coeff_v_per_k ?? 0,
        slopeEfficiency: r.slope_efficiency ?? 1,
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
  private history: CalibrationHistory = CalibrationHistory.fromRows([]);
  private loadedAtMs = 0;
  private loading: Promise<void> | null = null;

  constructor(private readonly pool: Pool, private readonly minReloadGapMs = 1_000) {}

  probe(tag: string): ProbeEntry | undefined {
    return this.lookup.probe(tag);
  }

  hasSite(tag: string): boolean {
    return this.lookup.hasSite(tag);
  }

  calibrationAt(tankId: number, tsMs: number): ProbeEntry['calibration'] {
    return this.history.at(tankId, tsMs);
  }

  /** Reloads from the database; concurrent callers share one query. */
  reload(): Promise<void> {
    this.loading ??= (async () => {
      try {
        const [rows, sites, history] = [
          await lookupsRepository.probes(this.pool), await lookupsRepository.siteTags(this.pool), await CalibrationHistory.load(this.pool),
        ];
        this.lookup = buildLookup(rows, sites);
        this.history = history;
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
