/**
 * The lab's week: routine assays twice a day on six tanks (Fe²⁺ by dichromate titration, total
 * Fe by ICP-OES), two grab samples, and the weekly probe checks in ZoBell's solution. Lab
 * ratios are the tank model's true ratio at sampling with a realistic lab scatter, so the
 * Calibration fit recovers the commissioning E°′, and B2's fouled probe shows up against them.
 */
import { probeCheck } from '../../shared/redox/index.ts';
import { AssayRow, ProbeCheckRowModel } from '../../api/src/db/workbench-models.ts';
import { labRatioOf } from '../../api/src/modules/assays/assay-match.ts';
import { auditAt, pointAt, type DemoContext } from './demo-context.ts';
import { DAY_MS, driftMv, HOUR_MS, MINUTE_MS } from './demo-story.ts';
import { wallTimeOf } from '../../shared/time/site-time.ts';
import { atLocal } from './site-clock.ts';
import { seededRng } from './seeded-random.ts';

export const ASSAY_TANKS = ['A1', 'A3', 'A6', 'B1', 'B2', 'B4'];
const TOTAL_FE_G_PER_L: Record<string, number> = { A: 9.6, B: 23.5 };
const METHOD = 'Dichromate titration / ICP-OES';
const ANALYSTS = ['R. Abernethy', 'T. Nakamura-Price', 'L. Osei'];
/** Results come back this long after sampling. */
const TURNAROUND_MS = 3 * HOUR_MS;

export type SeededAssay = { id: number; tankTag: string; sampledAtMs: number; enteredAtMs: number; labRatio: number | null; labRef: string };

const round = (x: number, step: number) => Math.round(x / step) * step;
const pad = (n: number, w = 2) => String(n).padStart(w, '0');

type Sample = { tankTag: string; atMs: number; source: string; note: string | null };

export function plannedSamples(ctx: DemoContext): Sample[] {
  const { story, timeZone: tz } = ctx;
  const samples: Sample[] = [];
  for (let d = -8; d <= 0; d += 1) {
    for (const [h, m] of [[7, 30], [19, 30]]) {
      const at = atLocal(story.endMs, d, h, m, tz);
      if (at < story.startMs + HOUR_MS || at > story.endMs - TURNAROUND_MS) continue;
      const day = wallTimeOf(at, tz);
      const source = `csv:kestrel-lab-${day.year}${pad(day.month)}${pad(day.day)}.csv`;
      for (const tankTag of ASSAY_TANKS) samples.push({ tankTag, atMs: at + ASSAY_TANKS.indexOf(tankTag) * 4 * MINUTE_MS, source, note: null });
    }
  }
  const grabs: Sample[] = [];
  grabs.push({
    tankTag: story.upset.tankTag, atMs: story.upset.fromMs + 25 * MINUTE_MS, source: 'form',
    note: 'Grab sample during the feed upset; titrated within 10 min of sampling',
  });
  grabs.push({
    tankTag: story.drift.tankTag, atMs: story.drift.refittedMs + 90 * MINUTE_MS, source: 'form',
    note: 'Check sample after the B2 probe was cleaned and refitted',
  });
  // Seeded at certain minutes of the day, a grab sample falls on the minute of a routine one of
  // its tank; a tank has one assay per sampling time, so the grab sample (with its note) stays.
  const key = (x: Sample) => `${x.tankTag}@${x.atMs}`;
  const grabKeys = new Set(grabs.map(key));
  return [...samples.filter((x) => !grabKeys.has(key(x))), ...grabs];
}

export async function seedAssays(ctx: DemoContext): Promise<SeededAssay[]> {
  const rng = seededRng('kestrel-lab/assays');
  const out: SeededAssay[] = [];
  let labSeq = 0;
  for (const s of plannedSamples(ctx).sort((a, b) => a.atMs - b.atMs)) {
    // A sample taken while the probe was out still counts in the lab, but this demo keeps every one matchable.
    const p = pointAt(ctx, s.tankTag, s.atMs);
    if (!p) continue;
    const tank = ctx.tanks.get(s.tankTag)!;
    const base = TOTAL_FE_G_PER_L[tank.circuitTag] ?? 10;
    const totalTrue = base * (1 + 0.04 * Math.sin((2 * Math.PI * s.atMs) / (3 * DAY_MS) + tank.id));
    const fe2True = totalTrue / (1 + p.trueRatio);
    const fe2 = Number(round(fe2True * (1 + rng.normal(0.015)), 0.01).toFixed(2));
    const feTotal = Number(round(totalTrue * (1 + rng.normal(0.01)), 0.05).toFixed(2));
    const enteredAtMs = s.atMs + TURNAROUND_MS + rng.between(-40, 40) * MINUTE_MS;
    const day = wallTimeOf(s.atMs, ctx.timeZone);
    labSeq += 1;
    const labRef = `KFL-${String(day.year).slice(2)}${pad(day.month)}${pad(day.day)}-${pad(labSeq, 3)}`;
    const row = await AssayRow.create({
      tankId: tank.id, sampledAt: new Date(s.atMs), fe2GPerL: fe2, feTotalGPerL: feTotal, unit: 'g/L', fe2Entered: fe2, feTotalEntered: feTotal,
      method: METHOD, analyst: rng.pick(ANALYSTS), labRef,
      note: s.note, source: s.source, createdBy: ctx.people.metallurgist.id, createdAt: new Date(enteredAtMs),
    });
    await auditAt(enteredAtMs, ctx.people.metallurgist.id, 'assay.create', 'assay', row.id, { tankId: tank.id, sampledAt: new Date(s.atMs).toISOString(), fe2, feTotal, source: s.source });
    out.push({ id: row.id, tankTag: s.tankTag, sampledAtMs: s.atMs, enteredAtMs, labRatio: labRatioOf(fe2, feTotal), labRef });
  }
  return out;
}

/** Days ago of the last weekly check per probe: spread over the week, so checks fall due one by one. */
const lastCheckDaysAgo = (i: number) => 0.5 + ((i * 0.61) % 5.2);

type PlannedCheck = { probeTag: string; atMs: number; note: string | null };

function plannedChecks(ctx: DemoContext): PlannedCheck[] {
  const { story, timeZone: tz } = ctx;
  const checks: PlannedCheck[] = [];
  [...ctx.probes.keys()].forEach((probeTag, i) => {
    // The round missed the overdue probe a week ago: its last check is more than one interval back.
    const last = probeTag === story.overdueProbeTag ? 8.6 : lastCheckDaysAgo(i);
    for (const daysAgo of [last + 7, last]) {
      const near = story.endMs - daysAgo * DAY_MS;
      let atMs = atLocal(near, 0, 9, 40 + 12 * i, tz);
      if (atMs > story.endMs - 30 * MINUTE_MS) atMs -= DAY_MS; // this morning's round has not happened yet
      checks.push({ probeTag, atMs, note: null });
    }
  });
  const d = story.drift;
  checks.push({ probeTag: d.probeTag, atMs: d.pulledMs - 25 * MINUTE_MS, note: 'Reads low in ZoBell: platinum dull, junction sluggish. Pulled for cleaning.' });
  checks.push({ probeTag: d.probeTag, atMs: d.refittedMs - 4 * MINUTE_MS, note: 'After cleaning: Pt polished with alumina, junction flushed, fresh 3 M KCl.' });
  return checks.filter((c) => c.atMs < story.endMs - 10 * MINUTE_MS);
}

export type SeededCheck = { probeTag: string; atMs: number; errorMv: number; pass: boolean };

export async function seedProbeChecks(ctx: DemoContext): Promise<SeededCheck[]> {
  const out: SeededCheck[] = [];
  const rng = seededRng('kestrel-lab/checks');
  const lastPass = new Map<string, number>();
  for (const c of plannedChecks(ctx).sort((a, b) => a.atMs - b.atMs)) {
    const probe = ctx.probes.get(c.probeTag)!;
    const tempC = Number(rng.between(22, 27).toFixed(1));
    const expected = probeCheck({ standard: 'zobell', tempC, reference: probe.reference, readingMv: 0, toleranceMv: probe.toleranceMv }).expectedMv;
    // A fouled platinum reads low in the standard just as in the tank.
    const errorMv = Math.max(-3, Math.min(3, rng.normal(1.8))) + driftMv(ctx.story, c.probeTag, c.atMs);
    const readingMv = Math.round(expected + errorMv);
    const result = probeCheck({ standard: 'zobell', tempC, reference: probe.reference, readingMv, toleranceMv: probe.toleranceMv });
    const row = await ProbeCheckRowModel.create({
      probeId: probe.id, standard: 'zobell', tempC, readingMv, toleranceMv: probe.toleranceMv, ...result,
      referenceE25V: probe.reference.e25V, referenceCoeffVPerK: probe.reference.coeffVPerK, checkedAt: new Date(c.atMs),
      checkedBy: ctx.people.metallurgist.id, note: c.note,
    });
    await auditAt(c.atMs, ctx.people.metallurgist.id, 'probe.check', 'probe', probe.id, { checkId: row.id, standard: 'zobell', tempC, readingMv, ...result });
    if (result.pass) lastPass.set(probe.tankTag, c.atMs);
    out.push({ probeTag: c.probeTag, atMs: c.atMs, errorMv: result.errorMv, pass: result.pass });
  }
  // The alarm engine's own record of the last check (its fallback when the checks feature is not asked).
  for (const [tankTag, atMs] of lastPass) {
    await ctx.sequelize.query('UPDATE alarm_inputs SET last_probe_check_at = ?, updated_at = ? WHERE tank_id = ?',
      { replacements: [new Date(atMs), new Date(atMs), ctx.tanks.get(tankTag)!.id] });
  }
  return out;
}
