/** Bytes sent, then a plain "checking" line while the server reads the rows. */
export function UploadProgress({ label, fraction }: { label: string; fraction: number }) {
  const pct = Math.round(fraction * 100);
  return (
    <div role="status" className="flex items-center gap-3 text-sm">
      <progress max={100} value={pct} className="h-2 w-48 accent-[var(--fs-info)]" aria-label={label} />
      <span className="tabular-nums text-ink-muted">{pct < 100 ? `${label}: ${pct} % sent` : `${label}: checking every row…`}</span>
    </div>
  );
}
