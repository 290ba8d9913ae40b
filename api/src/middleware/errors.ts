import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { ConnectionAcquireTimeoutError, ForeignKeyConstraintError, UniqueConstraintError } from 'sequelize';
import { AppError } from '../lib/app-error.ts';
import { logger } from '../lib/logger.ts';

type Problem = { type: string; title: string; status: number; detail: string; errors?: { path: string; message: string }[] } & Record<string, unknown>;

function send(res: Parameters<ErrorRequestHandler>[2], p: Problem) {
  res.status(p.status).type('application/problem+json').json(p);
}

export const notFoundHandler: RequestHandler = (req, res) => {
  send(res, { type: 'about:blank#not-found', title: 'Not found', status: 404, detail: `No route for ${req.method} ${req.path}` });
};

/** Maps every failure to one JSON shape; never leaks stack traces. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (err instanceof ZodError) {
    const errors = err.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
    return send(res, { type: 'about:blank#validation', title: 'Invalid input', status: 400, detail: errors.map((e) => `${e.path || '(body)'}: ${e.message}`).join('; '), errors });
  }
  if (err instanceof AppError) {
    return send(res, { type: `about:blank#${err.code}`, title: err.code, status: err.status, detail: err.message, ...err.extra });
  }
  if (err instanceof UniqueConstraintError) {
    const fields = Object.keys(err.fields ?? {}).join(', ');
    return send(res, { type: 'about:blank#conflict', title: 'Conflict', status: 409, detail: `Already exists${fields ? ` (${fields})` : ''}` });
  }
  if (err instanceof ForeignKeyConstraintError) {
    return send(res, { type: 'about:blank#conflict', title: 'Conflict', status: 409, detail: 'Refers to a record that does not exist or is still in use' });
  }
  if (err instanceof ConnectionAcquireTimeoutError) {
    res.set('Retry-After', '5');
    return send(res, { type: 'about:blank#busy', title: 'Busy', status: 503, detail: 'The server is busy; try again in a few seconds' });
  }
  // body-parser and multer errors carry a status (413, 400) and a safe message.
  const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
  if (status >= 400 && status < 500) {
    const detail = err.type === 'entity.parse.failed' ? 'Body is not valid JSON' : err.type === 'entity.too.large' ? 'Body too large' : String(err.message ?? 'Bad request');
    return send(res, { type: 'about:blank#bad-request', title: 'Bad request', status, detail });
  }
  logger.error({ err, path: req.path }, 'unhandled error');
  return send(res, { type: 'about:blank#internal', title: 'Internal error', status: 500, detail: 'Something went wrong on the server; it has been logged.' });
};
