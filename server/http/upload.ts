/**
 * One uploaded file read into memory with multer (never written to disk, so its name cannot
 * point anywhere). Every way an upload can go wrong becomes a clear 4xx.
 */
import type { Request, Response } from 'express';
import multer from 'multer';
import { HttpError } from './errors';

export function readUpload(req: Request, res: Response, field: string, maxBytes: number, what: string): Promise<Buffer> {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 5 } }).single(field);
  return new Promise((resolve, reject) => {
    upload(req, res, (error: unknown) => {
      if (error instanceof multer.MulterError) {
        return reject(
          error.code === 'LIMIT_FILE_SIZE'
            ? new HttpError(413, 'file_too_large', `${what} is at most ${Math.round(maxBytes / 1024 / 1024)} MB.`)
            : new HttpError(400, 'bad_upload', `The upload was refused: ${error.message}.`),
        );
      }
      // A broken multipart body (busboy's "Malformed part header" and the like) is the sender's fault.
      if (error) return reject(new HttpError(400, 'bad_upload', 'The upload could not be read. Send the file as multipart/form-data.'));
      if (!req.file) return reject(new HttpError(400, 'no_file', `Attach ${what.toLowerCase()} as a CSV file in the field "${field}".`));
      resolve(req.file.buffer);
    });
  });
}

export interface UploadSpec {
  field: string;
  maxBytes: number;
  /** Names the file in messages, e.g. "The runs file". */
  what: string;
}

export interface UploadedFile {
  bytes: Buffer;
  /** The name the browser sent, as given (make it safe before storing or showing it). */
  originalName: string;
}

const tooLarge = (spec: UploadSpec) => new HttpError(413, 'file_too_large', `${spec.what} is at most ${Math.round(spec.maxBytes / 1024 / 1024)} MB.`);

/**
 * Several optional files (one per field) and text fields of one multipart request, read into
 * memory. Missing files are left to the caller; each file must fit its own size limit. A request
 * that is not multipart reads as no files (its JSON body, if any, stays in req.body).
 */
export function readUploads(req: Request, res: Response, specs: readonly UploadSpec[]): Promise<Partial<Record<string, UploadedFile>>> {
  const largest = Math.max(...specs.map((s) => s.maxBytes));
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: largest, files: specs.length, fields: 10, fieldSize: 10 * 1024, parts: specs.length + 10 },
  }).fields(specs.map((s) => ({ name: s.field, maxCount: 1 })));
  return new Promise((resolve, reject) => {
    upload(req, res, (error: unknown) => {
      if (error instanceof multer.MulterError) {
        const spec = specs.find((s) => s.field === error.field);
        return reject(
          error.code === 'LIMIT_FILE_SIZE' && spec
            ? tooLarge(spec)
            : new HttpError(400, 'bad_upload', `The upload was refused: ${error.message}${error.field ? ` (${error.field})` : ''}.`),
        );
      }
      if (error) return reject(new HttpError(400, 'bad_upload', 'The upload could not be read. Send the files as multipart/form-data.'));
      const files = (req.files ?? {}) as Record<string, Express.Multer.File[]>;
      const out: Partial<Record<string, UploadedFile>> = {};
      for (const spec of specs) {
        const file = files[spec.field]?.[0];
        if (!file) continue;
        if (file.size > spec.maxBytes) return reject(tooLarge(spec));
        out[spec.field] = { bytes: file.buffer, originalName: file.originalname };
      }
      resolve(out);
    });
  });
}
