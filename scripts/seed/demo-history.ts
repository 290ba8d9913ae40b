/**
 * A week of history for a freshly seeded demo plant, so every screen has a story from the
 * first minute: readings per probe at 1-minute intervals played by the simulator's tank model
 * and stored through the ingest pipeline (conversion and rollups included), the alarms they
 * raised and who answered them, lab assays and probe checks, band changes, and the shift log.
 * Runs once, right after the plant is seeded into an empty database (scripts/seed.ts).
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import type { ConvertedReading } from '../../api/src/modules/readings/convert.ts';
import { SITE_SETTINGS } from '../../shared/schemas/workbench.ts';
import { loadSimProbes } from '../../simulators/plant/plant-db.ts';
import { appliedBandChanges, bandAtFor, seedBandChanges } from './demo-bands.ts';
import type { DemoContext } from './demo-context.ts';
import { seedAssays, seedProbeChecks } from './demo-lab.ts';
import { ensureDemoPeople } from './demo-people.ts';
import { DEMO_SITE } from './demo-plant.ts';
import { acknowledgements, cleaningActions, driftActions, overdueActions } from './demo-responses.ts';
import { seedShifts } from './demo-shifts.ts';
import { demoStory } from './demo-story.ts';
import { alarmDefinitions, applyPlanned, replayReadingAlarms } from './history-alarms.ts';
import { generateHistory } from './history-model.ts';
import { storeHistory } from './history-store.ts';

const PROBE_CHECK_INTERVAL_DAYS = SITE_SETTINGS.probeCheckIntervalDays.default; // the demo site keeps the default

export type DemoHistorySummary = { readings: number; assays: number; probeChecks: number; alarmActions: number; logEntries: number; ms: number };

type TankRow = { id: number; tag: string; circuit: string; band_low: number; band_high: number };
type ProbeRow = { id: number; tag: string; tank_tag: string; reference_id: string; reference_e25_v: number; reference_coeff_v_per_k: number; tolerance_mv: number };

async function plantOf(sequelize: Sequelize, siteTag: string) {
  const select = <T extends object>(sql: string) => sequelize.query<T>(sql, { replacements: { siteTag }, type: QueryTypes.SELECT });
  const [site] = await select<{ id: number; time_zone: string }>('SELECT id, time_zone FROM sites WHERE tag = :siteTag');
  if (!site) throw new Error(`demo history: site '${siteTag}' is missing`);
  const tanks = await select<TankRow>(`SELECT t.id, t.tag, c.tag AS circuit, t.band_low, t.band_high FROM tanks t
      JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id WHERE s.tag = :siteTag`);
  const probes = await select<ProbeRow>(`SELECT p.id, p.tag, t.tag AS tank_tag, p.reference_id, p.reference_e25_v, p.reference_coeff_v_per_k, p.tolerance_mv
      FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id
     WHERE s.tag = :siteTag AND p.active = 1 ORDER BY c.position, t.position`);
  return { site, tanks, probes };
}

export async function seedDemoHistory(sequelize: Sequelize, databaseUrl: string, nowMs = Date.now()): Promise<DemoHistorySummary> {
  const began = Date.now();
  const story = demoStory(nowMs);
  const { site, tanks, probes } = await plantOf(sequelize, DEMO_SITE.tag);

  const histories = generateHistory(await loadSimProbes(databaseUrl, DEMO_SITE.tag), story);
  const converted = await storeHistory(databaseUrl, DEMO_SITE.tag, histories);

  const ctx: DemoContext = {
    sequelize, story, siteId: site.id, timeZone: site.time_zone, people: await ensureDemoPeople(),
    tanks: new Map(tanks.map((t) => [t.tag, { id: t.id, circuitTag: t.circuit }])),
    probes: new Map(probes.map((p) => [p.tag, {
      id: p.id, tankTag: p.tank_tag, toleranceMv: p.tolerance_mv,
      reference: { id: p.reference_id, label: p.reference_id, e25V: p.reference_e25_v, coeffVPerK: p.reference_coeff_v_per_k, source: `probe ${p.tag}` },
    }])),
    points: new Map(histories.map((h) => [h.probe.tankTag, h.points])),
  };
  await seedBandChanges(ctx);

  const readingsByTank = new Map<number, ConvertedReading[]>();
  for (const list of converted.values()) if (list[0]) readingsByTank.set(list[0].tankId, list);
  const bands = appliedBandChanges(story);
  const tankById = new Map(tanks.map((t) => [t.id, t]));
  const bandAt = (tankId: number, tMs: number) => {
    const t = tankById.get(tankId)!;
    return bandAtFor(bands, t.tag, tMs, { low: t.band_low, high: t.band_high });
  };
  const defs = await alarmDefinitions(sequelize);
  const replayed = replayReadingAlarms(defs, readingsByTank, bandAt);

  const assays = await seedAssays(ctx);
  const checks = await seedProbeChecks(ctx);
  const drift = await driftActions(ctx, defs, assays);
  const automatic = [...replayed, ...drift.actions, ...overdueActions(ctx, defs, checks, PROBE_CHECK_INTERVAL_DAYS)];
  const alarmActions = await applyPlanned(sequelize, [...automatic, ...acknowledgements(ctx, defs, automatic), ...cleaningActions(ctx, defs)]);

  // The A3 episode, for the shift log: its below-band alarm and how long it stood.
  const a3 = tanks.find((t) => t.tag === story.upset.tankTag)!;
  const a3Def = defs.find((d) => d.tankId === a3.id && d.kind === 'ratio-below-band');
  const a3Changes = replayed.filter((a) => a.definitionId === a3Def?.id && a.atMs >= story.upset.fromMs && a.atMs < story.upset.toMs + 3 * 3_600_000);
  const a3From = a3Changes.find((a) => a.action === 'activate')?.atMs;
  const a3To = a3Changes.find((a) => a.action === 'clear')?.atMs;
  const [a3Instance] = a3From === undefined ? [] : await sequelize.query<{ id: number }>(
    'SELECT id FROM alarm_instances WHERE definition_id = ? AND opened_at = ?', { replacements: [a3Def!.id, new Date(a3From)], type: QueryTypes.SELECT });
  const logEntries = await seedShifts(ctx, {
    checks, drift: drift.events, a3AlarmId: a3Instance?.id ?? null,
    a3Alarm: a3From !== undefined && a3To !== undefined ? { fromMs: a3From, toMs: a3To } : null,
  });

  const readings = [...converted.values()].reduce((n, l) => n + l.length, 0);
  return { readings, assays: assays.length, probeChecks: checks.length, alarmActions, logEntries, ms: Date.now() - began };
}
