import { z } from 'zod';

/**
 * Historical import file: a header row, then one reading per line. Header names are matched
 * loosely (case, spaces, units in brackets ignored) so a historian's own export usually fits.
 */
export const IMPORT_HEADER_ALIASES = {
  probe: ['probe', 'probetag', 'tag', 'probeid'],
  time: ['time', 'ts', 'timestamp', 'timeutc', 'tsutc', 'datetime'],
  orpMv: ['orpmv', 'orp', 'orpmillivolts'],
  tempC: ['tempc', 'temp', 'temperature', 'temperaturec'],
} as const;
export type ImportField = keyof typeof IMPORT_HEADER_ALIASES;

/** 'ORP (mV)' → 'orpmv', 'Temperature [°C]' → 'temperaturec'. */
export function normaliseHeader(name: string): string {
  return name.toLowerCase().replace(/°/g, '').replace(/[^a-z0-9]/g, '');
}

/** Column index per field, or the list of fields the header lacks. */
export function mapImportHeader(header: string[]): { columns: Record<ImportField, number> } | { missing: ImportField[] } {
  const norm = header.map(normaliseHeader);
  const columns = {} as Record<ImportField, number>;
  const missing: ImportField[] = [];
  for (const [field, aliases] of Object.entries(IMPORT_HEADER_ALIASES) as [ImportField, readonly string[]][]) {
    const idx = norm.findIndex((h) => aliases.includes(h));
    if (idx < 0) missing.push(field);
    else columns[field] = idx;
  }
  return missing.length > 0 ? { missing } : { columns };
}

export const IMPORT_MAX_BYTES = 512 * 1024 * 1024;
/** Rejected rows kept for download; the count stays exact beyond it. */
export const IMPORT_MAX_KEPT_REJECTIONS = 100_000;

export type ImportJobStatus = 'queued' | 'running' | 'done' | 'failed';

export type ImportJobView = {
  id: number;
  fileName: string;
  fileBytes: number;
  status: ImportJobStatus;
  bytesRead: number;
  rowsRead: number;
  stored: number;
  duplicates: number;
  conflicts: number;
  rejected: number;
  error: string | null;
  createdBy: number;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
};

export const importIdParamSchema = z.object({ id: z.coerce.number().int().positive() });
