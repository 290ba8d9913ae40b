import type { DigestEvent, Section } from '@shared/schemas/digest';
import { formatDateTime } from '../../../lib/format';
import { DigestTable, type Column } from './digest-table';

type Props = { title: string; section: Section<DigestEvent>; csvHref: string; empty: string; timeZone: string };

/** Band changes, calibrations, assays, probe checks: when, which tank, what, who. */
export function EventSection({ title, section, csvHref, empty, timeZone }: Props) {
  const columns: Column<DigestEvent>[] = [
    { header: 'When', cell: (e) => <span className="whitespace-nowrap tabular-nums">{formatDateTime(e.at, timeZone)}</span> },
    { header: 'Tank', cell: (e) => e.tankTag ?? '—' },
    { header: 'What', cell: (e) => e.summary },
    { header: 'By', cell: (e) => e.by ?? '—' },
  ];
  return (
    <DigestTable title={title} csvHref={csvHref} columns={columns} rows={section.items}
      empty={section.available ? empty : 'Not recorded on this server yet.'} />
  );
}
