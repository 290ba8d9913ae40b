/** A plain progress bar with its percentage in words (role=progressbar for screen readers). */
export function ImportProgress({ label, fraction }: { label: string; fraction: number }) {
  const pct = Math.round(Math.min(1, Math.max(0, fraction)) * 100);
  return (
    <div className="flex flex-col gap-1">
      <div className="flex justify-between text-sm">
        <span>{label}</span>
        <span className="tabular-nums">{pct}%</span>
      </div>
      <div role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} className="h-3 overflow-hidden rounded-full border border-line-strong bg-panel-2">
        <div className="h-full bg-ink transition-[width]" style={{ width: `${pct}%` }} />
      </div>
    </div>
  );
}
