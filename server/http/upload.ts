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
