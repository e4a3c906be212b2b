import type { ErrorRequestHandler } from 'express';
import { ZodError } from 'zod';

/** An error the API answers with its own status and code: {error: {code, message, fields?}}. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    /** Further facts for the client, e.g. the seq a drive expects next. */
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export const notFound = (what = 'That') => new HttpError(404, 'not_found', `${what} was not found.`);

/** Zod issues as one message per field path (the first message wins). */
export function fieldMessages(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) fields[[...issue.path, key].join('.')] ??= 'This field is not allowed.';
      continue;
    }
    const key = issue.path.join('.') || '_';
    fields[key] ??= issue.message;
  }
  return fields;
}

export const validationError = (error: ZodError) =>
  new HttpError(400, 'validation_failed', 'Some fields need attention.', fieldMessages(error));

interface BodyParserError {
  type?: string;
  status?: number;
}

/** The last middleware: every failure leaves as JSON with the right status. */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) return next(err);
  const parserType = (err as BodyParserError).type;
  let http: HttpError;
  if (err instanceof HttpError) http = err;
  else if (err instanceof ZodError) http = validationError(err);
  else if (parserType === 'entity.parse.failed') http = new HttpError(400, 'malformed_json', 'The request body is not valid JSON.');
  else if (parserType === 'entity.too.large') http = new HttpError(413, 'body_too_large', 'The request body is too large.');
  else if (parserType === 'encoding.unsupported' || parserType === 'charset.unsupported')
    http = new HttpError(415, 'unsupported_encoding', 'The request body uses an unsupported encoding.');
  else {
    console.error(`${req.method} ${req.originalUrl}:`, err);
    http = new HttpError(500, 'internal_error', 'Something went wrong on our side. Please try again.');
  }
  res.status(http.status).json({ error: { code: http.code, message: http.message, ...(http.fields ? { fields: http.fields } : {}), ...http.details } });
};
