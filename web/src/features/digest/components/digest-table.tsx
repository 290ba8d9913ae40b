import type { ReactNode } from 'react';
import { CsvLink } from '../../../components/ui/csv-link';

export type Column<T> = {
  header: string;
  cell: (row: T) => ReactNode;
  numeric?: boolean;
};

type Props<T> = { title: string; csvHref: string; columns: Column<T>[]; rows: T[]; empty: string; note?: ReactNode; children?: ReactNode };

/** A digest section: title, optional picture, the table, and its CSV download (the same table from the server). */
export function DigestTable<T>({ title, csvHref, columns, rows, empty, note, children }: Props<T>) {
  return (
    <section aria-label={title} className="digest-section rounded-lg border border-line bg-panel">
      <header className="flex items-center justify-between gap-3 border-b border-line px-4 py-2">
        <h2 className="text-base font-bold">{title}</h2>
        {rows.length > 0 && (
          <CsvLink href={csvHref} label={`Download ${title} as CSV`}>CSV ↓</CsvLink>
        )}
      </header>
      <div className="flex flex-col gap-3 p-4">
        {children}
        {note}
        {rows.length === 0 ? (
          <p className="text-ink-muted">{empty}</p>
        ) : (
          <div className="overflow-x-auto print:overflow-visible">
            <table className="w-full border-collapse text-sm">
              <thead>
                <tr className="border-b border-line-strong text-left text-ink-muted">
                  {columns.map((c) => (
                    <th key={c.header} scope="col" className={`px-2 py-1 font-semibold ${c.numeric ? 'text-right' : ''}`}>{c.header}</th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {rows.map((r, i) => (
                  <tr key={i} className="border-b border-line align-top">
                    {columns.map((c) => (
                      <td key={c.header} className={`px-2 py-1 ${c.numeric ? 'text-right tabular-nums whitespace-nowrap' : ''}`}>{c.cell(r)}</td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </div>
    </section>
  );
}
