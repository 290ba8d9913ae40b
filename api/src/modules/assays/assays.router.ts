import { CSV_TYPE } from '../../lib/csv.ts';
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { ASSAY_CSV_MAX_BYTES, assayEntrySchema, assayRetractSchema, assaysQuerySchema } from '../../../../shared/schemas/assays.ts';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params, queryParams } from '../../middleware/validate.ts';
import { assayCsvService } from './assay-csv.service.ts';
import { assaysService } from './assays.service.ts';

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: ASSAY_CSV_MAX_BYTES, files: 1, fields: 10 } });

/** multer's errors carry a code but no status: map them to problem+json statuses here. */
const oneFile: RequestHandler = (req, res, next) => {
  upload.single('file')(req, res, (err?: unknown) => {
    if (!err) return next();
    const code = (err as { code?: string }).code;
    if (code === 'LIMIT_FILE_SIZE') {
      return next(new AppError(413, 'too-large', `The file is larger than ${ASSAY_CSV_MAX_BYTES / 1024 / 1024} MB: split it into smaller files`));
    }
    if (code?.startsWith('LIMIT_')) return next(AppError.badRequest(`Upload refused (${code}): send one CSV file in the field 'file'`));
    // busboy's parse errors (malformed multipart) carry no code: the client sent a broken body.
    if (!code) return next(AppError.badRequest(`The upload could not be read: ${(err as Error).message}`));
    next(err);
  });
};

function theFile(req: Parameters<RequestHandler>[0]): { buf: Buffer; name: string } {
  if (!req.file) throw AppError.badRequest("Attach a CSV file in the form field 'file'");
  // Only the base name is kept: it ends up in the record as the assays' source.
  const name = req.file.originalname.replace(/^.*[\\/]/, '').replace(/[^\w .,()+-]/g, '_').slice(0, 120) || 'upload.csv';
  return { buf: req.file.buffer, name };
}

/** Assays: everyone reads; metallurgists and admins enter, import and retract. */
export function assaysRouter(): Router {
  const r = Router();
  const write = requireRole('metallurgist', 'admin');
  r.get('/', requireSignIn, async (req, res) => {
    res.json(await assaysService.list(queryParams(assaysQuerySchema, req)));
  });
  r.get('/template.csv', requireSignIn, async (_req, res) => {
    res.type(CSV_TYPE).attachment('ferrisight-assays-template.csv').send(await assayCsvService.template());
  });
  r.post('/', write, async (req, res) => {
    res.status(201).json({ assay: await assaysService.create(body(assayEntrySchema, req), req.user!.id) });
  });
  r.post('/:id/retract', write, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json({ assay: await assaysService.retract(id, body(assayRetractSchema, req).reason, req.user!.id) });
  });
  r.post('/csv/preview', write, oneFile, async (req, res) => {
    const f = theFile(req);
    res.json(await assayCsvService.preview(f.buf, f.name));
  });
  r.post('/csv/commit', write, oneFile, async (req, res) => {
    const f = theFile(req);
    res.status(201).json(await assayCsvService.commit(f.buf, f.name, req.user!.id));
  });
  return r;
}
