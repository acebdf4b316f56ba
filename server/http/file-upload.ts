import type { Request, Response } from 'express';
import multer from 'multer';
import type { AppError } from './app-error';

/**
 * The API's only multipart routes: the JSON-only rule (request-shape.ts) lets these through and
 * each reads its one file with `receiveFile`.
 */
const MULTIPART_ROUTES = [/^\/sheets\/[^/]+\/datasets$/, /^\/sheets\/import$/];

export const isFileUpload = (method: string, path: string): boolean =>
  method === 'POST' && MULTIPART_ROUTES.some((route) => route.test(path));

/**
 * Reads one file from field `file` into memory (never to disk), with a few short text fields.
 * Multer stops reading at the limit; over it the caller's `tooLarge` error is raised.
 */
export function receiveFile(
  req: Request,
  res: Response,
  { maxBytes, tooLarge, noFile }: { maxBytes: number; tooLarge: () => AppError; noFile: () => AppError },
): Promise<Express.Multer.File> {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: 1, fields: 8, fieldSize: 1024, parts: 10 },
  }).single('file');
  return new Promise((resolve, reject) => {
    upload(req, res, (error: unknown) => {
      if (error instanceof multer.MulterError && error.code === 'LIMIT_FILE_SIZE') reject(tooLarge());
      else if (error instanceof multer.MulterError && error.code === 'LIMIT_UNEXPECTED_FILE')
        reject(noFile());
      else if (error) reject(error);
      else if (!req.file) reject(noFile());
      else resolve(req.file);
    });
  });
}
