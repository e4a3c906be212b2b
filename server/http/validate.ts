import type { Request } from 'express';
import type { z } from 'zod';
import { validationError } from './errors';

/** Parses a request part with a shared zod schema; a failure becomes a 400 with field messages. */
function parseWith<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw validationError(result.error);
  return result.data;
}

export const parseBody = <S extends z.ZodType>(schema: S, req: Request) => parseWith(schema, req.body ?? {});
export const parseQuery = <S extends z.ZodType>(schema: S, req: Request) => parseWith(schema, { ...req.query });
export const parseParams = <S extends z.ZodType>(schema: S, req: Request) => parseWith(schema, req.params);
