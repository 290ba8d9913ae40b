import type { CsvRowError } from '@shared/schemas/assays';

/** Every problem of a file by row (the file's line number) and column, with the reason in words. */
export function CsvErrorsTable({ errors, truncated }: { errors: CsvRowError[]; truncated: boolean }) {
  return (
    <div className="max-h-80 overflow-auto rounded-md border border-line">
      <table className="w-full text-left text-sm" aria-label="Problems in the file">
        <thead className="sticky top-0 bg-panel-2 text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-1.5 text-right font-semibold">Row</th>
            <th scope="col" className="px-3 py-1.5 font-semibold">Column</th>
            <th scope="col" className="px-3 py-1.5 font-semibold">Value</th>
            <th scope="col" className="px-3 py-1.5 font-semibold">Problem</th>
          </tr>
        </thead>
        <tbody>
          {errors.map((e, i) => (
            <tr key={`${e.row}-${e.column}-${i}`} className="border-t border-line" data-testid="csv-error">
              <td className="px-3 py-1.5 text-right tabular-nums">{e.row}</td>
              <td className="px-3 py-1.5 font-mono text-xs">{e.column}</td>
              <td className="max-w-48 truncate px-3 py-1.5 font-mono text-xs" title={e.value}>{e.value || <span className="text-ink-muted">(empty)</span>}</td>
              <td className="px-3 py-1.5 font-medium text-attention-1-ink">
                <span aria-hidden="true">✕ </span>
                {e.message}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {truncated && <p className="px-3 py-2 text-sm text-ink-muted">More problems exist than are listed: fix these and check again.</p>}
    </div>
  );
}
