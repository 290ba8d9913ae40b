/**
 * Converting between a wall-clock time at the site and an instant. Operators think in
 * site time even when the browser sits in another zone (a remote engineer, a laptop in UTC).
 */

function offsetMs(instantMs: number, timeZone: string): number {
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone,
    hourCycle: 'h23',
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    second: '2-digit',
  }).formatToParts(instantMs);
  const n = (type: string) => Number(parts.find((p) => p.type === type)?.value);
  const asUtc = Date.UTC(n('year'), n('month') - 1, n('day'), n('hour'), n('minute'), n('second'));
  return asUtc - Math.floor(instantMs / 1000) * 1000;
}

/** "2026-12-01T08:00" read as site time → ISO instant; null when not a valid value. */
export function siteLocalToIso(local: string, timeZone: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(local);
  if (!m) return null;
  const wall = Date.UTC(+m[1], +m[2] - 1, +m[3], +m[4], +m[5]);
  // Two passes settle the offset across a daylight-saving change.
  let t = wall - offsetMs(wall, timeZone);
  t = wall - offsetMs(t, timeZone);
  return Number.isFinite(t) ? new Date(t).toISOString() : null;
}

/** ISO instant → "2026-12-01T08:00" in site time, for a datetime-local input. */
export function isoToSiteLocal(iso: string | number, timeZone: string): string {
  const ms = typeof iso === 'number' ? iso : Date.parse(iso);
  const local = new Date(ms + offsetMs(ms, timeZone));
  return local.toISOString().slice(0, 16);
}
