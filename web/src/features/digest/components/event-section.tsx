import type { DigestEvent, Section } from '@shared/schemas/digest';
import { formatDateTime } from '../../../lib/format';
import { DigestTable, type Column } from './digest-table';

type Props = { title: string; section: Section<DigestEvent>; fileName: string; empty: string; timeZone: string };

/** Band changes, calibrations, assays, probe checks: when, which tank, what, who. */
export function EventSection({ title, section, fileName, empty, timeZone }: Props) {
  const columns: Column<DigestEvent>[] = [
    { header: 'When', cell: (e) => <span className="whitespace-nowrap tabular-nums">{formatDateTime(e.at, timeZone)}</span>, csv: [['at_utc', (e) => e.at]] },
    { header: 'Tank', cell: (e) => e.tankTag ?? '—', csv: [['tank', (e) => e.tankTag]] },
    { header: 'What', cell: (e) => e.summary, csv: [['what', (e) => e.summary]] },
    { header: 'By', cell: (e) => e.by ?? '—', csv: [['by', (e) => e.by]] },
  ];
  return (
    <DigestTable title={title} fileName={fileName} columns={columns} rows={section.items}
      empty={section.available ? empty : 'Not recorded on this server yet.'} />
  );
}
