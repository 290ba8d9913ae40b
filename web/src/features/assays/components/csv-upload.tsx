import { useRef, useState } from 'react';
import type { CsvPreview, CsvRowError } from '@shared/schemas/assays';
import { Button } from '../../../components/ui/button';
import { FormError } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { formMessage } from '../../../lib/form';
import { useCommitAssayCsv } from '../api/commit-assay-csv';
import { usePreviewAssayCsv } from '../api/preview-assay-csv';
import { CsvErrorsTable } from './csv-errors-table';
import { UploadProgress } from './upload-progress';

const DELIMITERS: Record<CsvPreview['delimiter'], string> = { ',': 'commas', ';': 'semicolons', '\t': 'tabs' };

/** Choose a file → every row checked → store all rows or none. */
export function CsvUpload() {
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState<{ label: string; fraction: number } | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const preview = usePreviewAssayCsv();
  const commit = useCommitAssayCsv();
  const p = preview.data;
  // A refused commit returns the row problems too (someone may have stored a duplicate meanwhile).
  const commitRows = commit.error instanceof ApiError ? (commit.error.errors as unknown as CsvRowError[]).filter((e) => typeof e.row === 'number') : [];

  const choose = (f: File | null) => {
    setFile(f);
    setDone(null);
    commit.reset();
    if (!f) return preview.reset();
    // Cleared so that choosing the same, corrected file again fires a change.
    if (input.current) input.current.value = '';
    setProgress({ label: 'Checking', fraction: 0 });
    preview.mutate({ file: f, onProgress: (fraction) => setProgress({ label: 'Checking', fraction }) }, { onSettled: () => setProgress(null) });
  };
  const store = () => {
    if (!file) return;
    setProgress({ label: 'Storing', fraction: 0 });
    commit.mutate({ file, onProgress: (fraction) => setProgress({ label: 'Storing', fraction }) }, {
      onSettled: () => setProgress(null),
      onSuccess: (r) => {
        setDone(`${r.inserted} assay${r.inserted === 1 ? '' : 's'} stored from ${r.fileName}.`);
        setFile(null);
        preview.reset();
      },
    });
  };

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-1 text-sm font-semibold">
          CSV file (UTF-8; commas or semicolons)
          <input ref={input} type="file" accept=".csv,text/csv" onChange={(e) => choose(e.target.files?.[0] ?? null)} className="text-sm font-normal" />
        </label>
        <a href="/api/assays/template.csv" download className="text-sm text-info-ink underline">Download the template</a>
      </div>
      {progress && <UploadProgress label={progress.label} fraction={progress.fraction} />}
      {done && <Notice>{done}</Notice>}
      <FormError>{formMessage(preview.error) ?? (commitRows.length ? null : formMessage(commit.error))}</FormError>
      {p && (
        <div className="flex flex-col gap-3">
          <p className="text-sm" data-testid="csv-summary">
            <strong>{p.fileName}</strong>: {p.rowCount} rows, <strong>{p.validCount} valid</strong>, {p.errors.length} problem{p.errors.length === 1 ? '' : 's'} ·
            separated by {DELIMITERS[p.delimiter]}
            {p.decimalComma && ' · decimal commas read'}
            {p.bom && ' · byte-order mark skipped'}
          </p>
          {p.errors.length > 0 ? (
            <>
              <CsvErrorsTable errors={p.errors} truncated={p.errorsTruncated} />
              <p className="text-sm text-ink-muted">Nothing is stored while any row has a problem. Fix the file and choose it again.</p>
            </>
          ) : null}
        </div>
      )}
      {commitRows.length > 0 && <CsvErrorsTable errors={commitRows} truncated={false} />}
      <div className="flex justify-end gap-3">
        {file && <Button onClick={() => choose(null)}>Clear</Button>}
        <Button variant="primary" onClick={store} disabled={!p || p.errors.length > 0 || p.validCount === 0 || commit.isPending || preview.isPending}>
          {commit.isPending ? 'Storing…' : p && p.errors.length === 0 ? `Store all ${p.validCount} rows` : 'Store rows'}
        </Button>
      </div>
    </div>
  );
}
