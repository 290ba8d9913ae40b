import { useState } from 'react';
import type { ImportJobView } from '@shared/schemas/import';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { Panel } from '../../../components/ui/panel';
import { formatDateTime } from '../../../lib/format';
import { rejectionsUrl, useImportJob } from '../api/get-import-job';
import { useImportJobs } from '../api/get-import-jobs';
import { useStartImport } from '../api/start-import';
import { ImportProgress } from './import-progress';

/**
 * Historical import: choose a CSV, upload it (progress of the bytes sent), then follow the
 * job (progress of the rows stored) to its summary. Running the same file again is safe.
 */
export function ImportPanel({ timeZone }: { timeZone: string }) {
  const [file, setFile] = useState<File | null>(null);
  const [sent, setSent] = useState<number | null>(null);
  const [jobId, setJobId] = useState<number | null>(null);
  const start = useStartImport();
  const job = useImportJob(jobId);
  const jobs = useImportJobs(true);

  const upload = () => {
    if (!file) return;
    setSent(0);
    start.mutate({ file, onProgress: setSent }, { onSuccess: (j) => setJobId(j.id), onSettled: () => setSent(null) });
  };

  return (
    <Panel title="Import past readings">
      <div className="flex flex-col gap-3">
        <p className="text-sm text-ink-muted">
          A CSV with a header line naming <code>probe</code>, <code>time</code> (ISO 8601 with Z or an offset), <code>orp_mv</code> and <code>temp_c</code>.
          Each reading is converted with the calibration valid at its time. Readings already stored are skipped; different values for a stored
          time are kept aside as conflicts, never overwritten.
        </p>
        <div className="flex flex-wrap items-center gap-3">
          <input type="file" accept=".csv,text/csv" aria-label="CSV file" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
          <Button variant="primary" onClick={upload} disabled={!file || start.isPending}>Upload and import</Button>
        </div>
        {sent !== null && <ImportProgress label="Uploading" fraction={sent} />}
        {start.isError && <Notice tone="attention">{start.error.message}</Notice>}
        {job.data && <JobSummary job={job.data} timeZone={timeZone} />}
        {(jobs.data ?? []).filter((j) => j.id !== jobId).slice(0, 5).map((j) => (
          <div key={j.id} className="text-sm text-ink-muted">
            #{j.id} {j.fileName} · {formatDateTime(j.createdAt, timeZone)} · {j.status} · {j.stored.toLocaleString()} stored, {j.rejected.toLocaleString()} rejected
            {j.rejected > 0 && <> · <a className="text-info-ink underline" href={rejectionsUrl(j.id)} download>rejected rows</a></>}
          </div>
        ))}
      </div>
    </Panel>
  );
}

function JobSummary({ job, timeZone }: { job: ImportJobView; timeZone: string }) {
  const n = (v: number) => v.toLocaleString();
  if (job.status === 'queued' || job.status === 'running') {
    return <ImportProgress label={`${job.fileName}: ${n(job.rowsRead)} rows read`} fraction={job.fileBytes > 0 ? job.bytesRead / job.fileBytes : 0} />;
  }
  return (
    <div className="rounded-md border border-line p-3" data-testid="import-summary" role="status">
      <div className="font-semibold">
        {job.fileName}: {job.status === 'done' ? 'finished' : 'stopped'} {job.finishedAt ? formatDateTime(job.finishedAt, timeZone) : ''}
      </div>
      {job.error && <Notice tone="attention" className="mt-2">{job.error}</Notice>}
      <dl className="mt-2 grid grid-cols-2 gap-2 tabular-nums sm:grid-cols-5">
        {([['Rows read', job.rowsRead], ['Stored', job.stored], ['Already there', job.duplicates], ['Conflicts', job.conflicts], ['Rejected', job.rejected]] as const).map(([label, v]) => (
          <div key={label}>
            <dt className="text-sm text-ink-muted">{label}</dt>
            <dd className="text-lg font-bold">{n(v)}</dd>
          </div>
        ))}
      </dl>
      {job.rejected > 0 && (
        <a className="mt-2 inline-block text-info-ink underline" href={rejectionsUrl(job.id)} download>
          Download the rejected rows with their line numbers and reasons (CSV)
        </a>
      )}
    </div>
  );
}
