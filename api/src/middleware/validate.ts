import type { Request } from 'express';
import type { z } from 'zod';

/** Parse helpers: a ZodError becomes a 400 with field issues in the error middleware. */
export const body = <S extends z.ZodType>(schema: S, req: Request): z.infer<S> => schema.parse(req.body ?? {});
export const queryParams = <S extends z.ZodType>(schema: S, req: Request): z.infer<S> => schema.parse(req.query ?? {});
export const params = <S extends z.ZodType>(schema: S, req: Request): z.infer<S> => schema.parse(req.params ?? {});
