import { shiftAt, type ShiftPattern } from '../../../../shared/shifts/shift-boundaries.ts';
import type { ShiftView } from '../../../../shared/schemas/shifts.ts';
import { AppError } from '../../lib/app-error.ts';
import { shiftsRepository, type ShiftRow, type SiteRow } from './shifts.repository.ts';

/** Until someone saves a pattern: two 12-hour shifts handing over at 06:00 and 18:00 site time. */
export const DEFAULT_PATTERN: ShiftPattern = { shiftsPerDay: 2, firstStartMin: 360 };

export type SiteContext = { site: SiteRow; pattern: ShiftPattern; saved: boolean };
export type ResolvedShift = { startsAtMs: number; endsAtMs: number; row: ShiftRow | null };

export async function siteContext(siteId?: number): Promise<SiteContext> {
  const site = await shiftsRepository.site(siteId);
  if (!site) throw AppError.notFound('Site');
  const saved = await shiftsRepository.pattern(site.id);
  return { site, pattern: saved ?? DEFAULT_PATTERN, saved: saved !== null };
}

/**
 * The shift containing an instant. A recorded shift wins over the pattern: its bounds were
 * frozen when it was first written to, so changing the pattern never moves a past shift.
 */
export async function resolveShift(ctx: SiteContext, atMs: number): Promise<ResolvedShift> {
  const [row] = await shiftsRepository.rowsBetween(ctx.site.id, atMs, atMs + 1);
  if (row) return { startsAtMs: row.startsAt.getTime(), endsAtMs: row.endsAt.getTime(), row };
  const w = shiftAt(atMs, ctx.pattern, ctx.site.timeZone);
  return { startsAtMs: w.startsAtMs, endsAtMs: w.endsAtMs, row: null };
}

export function shiftView(siteId: number, s: ResolvedShift, nowMs = Date.now()): ShiftView {
  const r = s.row;
  return {
    id: r?.id ?? null,
    siteId,
    startsAt: new Date(s.startsAtMs).toISOString(),
    endsAt: new Date(s.endsAtMs).toISOString(),
    status: r?.closedAt ? 'closed' : s.startsAtMs > nowMs ? 'upcoming' : 'open',
    closedAt: r?.closedAt ? r.closedAt.toISOString() : null,
    closedBy: r?.closedById ? { id: r.closedById, name: r.closedByName ?? '' } : null,
    handoverNote: r?.handoverNote ?? null,
  };
}
