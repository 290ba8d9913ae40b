/**
 * The shift log of the demo week: every past shift closed by its supervisor with a handover
 * note, and log entries where something happened (the A3 feed upset, B2's probe, the band
 * changes), plus routine rounds. Written only when the shift tables exist (they belong to the
 * Shift digest); entries are stored with the time they were written, so they go in directly.
 */
import { QueryTypes } from 'sequelize';
import type { DemoContext } from './demo-context.ts';
import type { SeededCheck } from './demo-lab.ts';
import { crewAt, type Person } from './demo-people.ts';
import type { DriftEvent } from './demo-responses.ts';
import { DAY_MS, driftMv, MINUTE_MS } from './demo-story.ts';
import { atLocal, clockText } from './site-clock.ts';
import { seededRng } from './seeded-random.ts';

type Entry = { atMs: number; author: Person; body: string; tankTag?: string; alarmId?: number };
type Shift = { startsAtMs: number; endsAtMs: number };

export type ShiftInputs = { checks: SeededCheck[]; drift: DriftEvent[]; a3AlarmId: number | null; a3Alarm: { fromMs: number; toMs: number } | null };

export async function hasShiftTables(ctx: DemoContext): Promise<boolean> {
  const rows = await ctx.sequelize.query<{ n: number }>(
    `SELECT COUNT(*) AS n FROM information_schema.tables
      WHERE table_schema = DATABASE() AND table_name IN ('shifts', 'shift_log_entries')`, { type: QueryTypes.SELECT });
  return Number(rows[0]?.n) === 2;
}

/** Shifts of the default pattern (06:00 and 18:00 site time) overlapping the week, oldest first. */
function shiftsOfWeek(ctx: DemoContext): Shift[] {
  const starts: number[] = [];
  for (let d = -8; d <= 1; d += 1) for (const h of [6, 18]) starts.push(atLocal(ctx.story.endMs, d, h, 0, ctx.timeZone));
  starts.sort((a, b) => a - b);
  const out: Shift[] = [];
  for (let i = 0; i + 1 < starts.length; i += 1) {
    if (starts[i + 1] > ctx.story.startMs && starts[i] <= ctx.story.endMs) out.push({ startsAtMs: starts[i], endsAtMs: starts[i + 1] });
  }
  return out;
}

function storyEntries(ctx: DemoContext, inputs: ShiftInputs): Entry[] {
  const { story, people, timeZone: tz } = ctx;
  const t = (ms: number) => clockText(ms, tz);
  const met = people.metallurgist;
  const out: Entry[] = [];
  const u = story.upset;
  const a3 = inputs.a3Alarm;
  out.push({ atMs: u.fromMs + 6 * MINUTE_MS, author: crewAt(people, u.fromMs, tz).operator, tankTag: u.tankTag,
    body: 'A3 ratio falling fast, under 9 and dropping. Regrind thickener underflow looks heavy; told the control room.' });
  if (a3) {
    out.push({ atMs: a3.fromMs + 6 * MINUTE_MS, author: crewAt(people, a3.fromMs, tz).supervisor, tankTag: u.tankTag, alarmId: inputs.a3AlarmId ?? undefined,
      body: `P1 on A3 (below band) at ${t(a3.fromMs)}: underflow to A3 cut back and A3 air raised to 110 %. Watching A4 downstream.` });
    out.push({ atMs: a3.toMs + 4 * MINUTE_MS, author: crewAt(people, a3.toMs, tz).operator, tankTag: u.tankTag, alarmId: inputs.a3AlarmId ?? undefined,
      body: `A3 back in band at ${t(a3.toMs)}, about ${Math.round((a3.toMs - a3.fromMs) / MINUTE_MS)} min below. Air back to normal once the ratio passed 10.` });
  }
  out.push({ atMs: u.fromMs + 32 * MINUTE_MS, author: met, tankTag: u.tankTag, body: `Grab sample from A3 at ${t(u.fromMs + 25 * MINUTE_MS)} for titration, result on Assays.` });
  const b = story.bandChanges;
  out.push({ atMs: b.trainAMs + 20 * MINUTE_MS, author: met, tankTag: 'A1', body: 'Train A upper limit raised from 20 to 25 (target 14) on A1–A6 after lab test LT-0412. Reason on Bands.' });
  out.push({ atMs: b.b4Ms + 15 * MINUTE_MS, author: met, tankTag: 'B4', body: 'B4 band capped at ratio 2 (passivation in the residue, SEM report KF-R-118).' });
  const d = story.drift;
  const flagged = inputs.drift.find((e) => e.tankTag === d.tankTag && e.change === 'activate');
  if (flagged) {
    out.push({ atMs: flagged.atMs + 25 * MINUTE_MS, author: met, tankTag: d.tankTag,
      body: `B2 probe reads ${Math.abs(flagged.diffMv).toFixed(0)} mV under the lab (${flagged.labRef}); its ratio on screen is low by about ×${Math.exp(Math.abs(flagged.diffMv) / 30.4).toFixed(1)}. ZoBell check and clean planned.` });
  }
  const fail = inputs.checks.find((c) => c.probeTag === d.probeTag && !c.pass);
  const recheck = inputs.checks.find((c) => c.probeTag === d.probeTag && c.pass && c.atMs > d.pulledMs);
  if (fail && recheck) {
    const mv = (x: number) => `${x >= 0 ? '+' : '−'}${Math.abs(x).toFixed(0)} mV`;
    out.push({ atMs: d.refittedMs + 10 * MINUTE_MS, author: met, tankTag: d.tankTag,
      body: `B2 probe pulled at ${t(d.pulledMs)}: ZoBell ${mv(fail.errorMv)} (fail). Platinum polished, junction flushed, fresh KCl; recheck ${mv(recheck.errorMv)} (pass). Stale alarm was out of service while it was out; B2 now reads about ${Math.abs(driftMv(story, d.probeTag, d.pulledMs - 1)).toFixed(0)} mV higher.` });
  }
  return out;
}

const ROUNDS = [
  'Round done: blowers A1–A6 running, B-train peroxide day tank at {n} %, no leaks at the launders.',
  'Round done: all agitators running, A-train air header at {p} kPa, B-train steam on temperature.',
  'Round done: nothing unusual; hosed the spill at the B3 launder, sump pump running.',
  'Lab samples taken on time and sent up.',
];

function handover(ctx: DemoContext, s: Shift, entries: Entry[], overdueSinceMs: number): string {
  const lines: string[] = [];
  const mine = entries.filter((e) => e.atMs >= s.startsAtMs && e.atMs < s.endsAtMs && e.tankTag);
  if (mine.some((e) => e.tankTag === ctx.story.upset.tankTag && e.alarmId)) lines.push('A3 feed upset this shift (P1, acknowledged, back in band); keep an eye on regrind thickener underflow.');
  if (mine.some((e) => e.tankTag === 'B2')) lines.push(s.endsAtMs > ctx.story.drift.refittedMs ? 'B2 probe cleaned and rechecked; reading trusted again.' : 'B2 probe reads low against the lab; check and clean planned.');
  if (mine.some((e) => e.body.includes('upper limit'))) lines.push('Train A band now 8–25, target 14.');
  if (s.endsAtMs > overdueSinceMs) lines.push(`A6 probe check is overdue (missed in last week's round): metallurgy to do it.`);
  if (lines.length === 0) lines.push('All ten tanks in band through the shift; no alarms standing.');
  lines.push('Nothing else outstanding.');
  return lines.join(' ');
}

export async function seedShifts(ctx: DemoContext, inputs: ShiftInputs): Promise<number> {
  if (!(await hasShiftTables(ctx))) return 0;
  const rng = seededRng('kestrel-shifts');
  const { story, people, timeZone: tz } = ctx;
  const entries = storyEntries(ctx, inputs);
  const shifts = shiftsOfWeek(ctx);
  for (const s of shifts) {
    const crew = crewAt(people, s.startsAtMs + MINUTE_MS, tz);
    const roundAt = s.startsAtMs + rng.between(35, 70) * MINUTE_MS;
    const text = rng.pick(ROUNDS).replace('{n}', String(Math.round(rng.between(45, 85)))).replace('{p}', String(Math.round(rng.between(118, 132))));
    entries.push({ atMs: roundAt, author: crew.operator, body: text });
  }
  const lastCheck = inputs.checks.filter((c) => `${c.probeTag}` === story.overdueProbeTag && c.pass).sort((a, b) => b.atMs - a.atMs)[0];
  const overdueSinceMs = lastCheck ? lastCheck.atMs + 7 * DAY_MS : Infinity;
  const q = (sql: string, replacements: unknown[]) => ctx.sequelize.query(sql, { replacements, type: QueryTypes.INSERT });
  let written = 0;
  for (const s of shifts) {
    const mine = entries.filter((e) => e.atMs >= s.startsAtMs && e.atMs < s.endsAtMs && e.atMs < story.endMs).sort((a, b) => a.atMs - b.atMs);
    const closed = s.endsAtMs <= story.endMs;
    if (!closed && mine.length === 0) continue;
    const closedAtMs = closed ? Math.max(s.endsAtMs, Math.min(s.endsAtMs + rng.between(4, 14) * MINUTE_MS, story.endMs)) : null;
    const closer = crewAt(people, s.startsAtMs + MINUTE_MS, tz).supervisor;
    const [shiftId] = await q(
      'INSERT INTO shifts (site_id, starts_at, ends_at, closed_at, closed_by, handover_note, created_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
      [ctx.siteId, new Date(s.startsAtMs), new Date(s.endsAtMs), closedAtMs ? new Date(closedAtMs) : null, closed ? closer.id : null,
        closed ? handover(ctx, s, mine, overdueSinceMs) : null, new Date(mine[0]?.atMs ?? closedAtMs ?? s.startsAtMs)]);
    for (const e of mine) {
      await q('INSERT INTO shift_log_entries (shift_id, author_id, at, body, tank_id, alarm_id) VALUES (?, ?, ?, ?, ?, ?)',
        [shiftId, e.author.id, new Date(e.atMs), e.body, e.tankTag ? ctx.tanks.get(e.tankTag)!.id : null, e.alarmId ?? null]);
      written += 1;
    }
  }
  return written;
}
