import fs from 'node:fs';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { Router, type RequestHandler } from 'express';
import { sendCsvRows } from '../../lib/csv.ts';
import multer from 'multer';
import { IMPORT_MAX_BYTES, importIdParamSchema } from '../../../../shared/schemas/import.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireRole } from '../../middleware/auth.ts';
import { params } from '../../middleware/validate.ts';
import { importService } from './import.service.ts';

export type ImportRouterOptions = { dataDir: string; retentionDays: number };

/** Multer writes the upload straight to disk; its errors become problem+json like every other. */
function uploadTo(dir: string): RequestHandler {
  const upload = multer({
    storage: multer.diskStorage({
      destination: (_req, _file, cb) => fs.mkdir(dir, { recursive: true }, (err) => cb(err ?? null, dir)),
      filename: (_req, _file, cb) => cb(null, `import-${Date.now()}-${randomBytes(6).toString('hex')}.csv`),
    }),
    limits: { fileSize: IMPORT_MAX_BYTES, files: 1, fields: 5 },
  }).single('file');
  return (req, res, next) => upload(req, res, (err: unknown) => {
    if (err instanceof multer.MulterError) {
      const tooBig = err.code === 'LIMIT_FILE_SIZE';
      return next(new AppError(tooBig ? 413 : 400, tooBig ? 'too-large' : 'bad-upload',
        tooBig ? `The file is larger than ${IMPORT_MAX_BYTES / 1024 / 1024} MB` : `Upload refused: ${err.message}`));
    }
    // busboy's parse errors (malformed multipart) carry no code: the client sent a broken body.
    if (err && !(err as { code?: string }).code) return next(AppError.badRequest(`The upload could not be read: ${(err as Error).message}`));
    next(err);
  });
}

/** /api/readings/imports: historical import, for metallurgists and admins. */
export function importRouter(o: ImportRouterOptions): Router {
  const r = Router();
  const allowed = requireRole('metallurgist', 'admin');
  // The role check comes before multer, so a refused user's file never reaches the disk.
  r.post('/imports', allowed, uploadTo(path.join(o.dataDir, 'uploads')), async (req, res) => {
    if (!req.file) throw AppError.badRequest("Attach the CSV file as multipart field 'file'");
    res.status(202).json({ job: await importService.submit(req.file, req.user!.id, o.retentionDays) });
  });
  r.get('/imports', allowed, async (_req, res) => {
    res.json({ jobs: await importService.list() });
  });
  r.get('/imports/:id', allowed, async (req, res) => {
    const job = await importService.get(params(importIdParamSchema, req).id);
    if (!job) throw AppError.notFound('Import job');
    res.json({ job });
  });
  r.get('/imports/:id/rejections', allowed, async (req, res) => {
    const { id } = params(importIdParamSchema, req);
    await sendCsvRows(res, { fileName: `ferrisight-import-${id}-rejected-rows.csv`, columns: ['line', 'reason', 'content'], source: await importService.rejections(id) });
  });
  return r;
}
