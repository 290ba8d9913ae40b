import { toCsv, type CsvCell } from '../../../lib/csv';
import { Button } from '../../../components/ui/button';

/**
 * Saves a table the page already holds as CSV (no server round trip). The byte-order mark
 * lets spreadsheet programs read °C and Fe²⁺ as UTF-8.
 */
export function CsvDownloadButton({ fileName, header, rows }: { fileName: string; header: string[]; rows: CsvCell[][] }) {
  const save = () => {
    const url = URL.createObjectURL(new Blob(['\uFEFF', toCsv(header, rows)], { type: 'text/csv;charset=utf-8' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = fileName;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
  };
  return (
    <Button size="sm" variant="ghost" onClick={save} className="print:hidden" aria-label={`Download ${fileName}`}>
      CSV ↓
    </Button>
  );
}
