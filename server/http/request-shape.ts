import express, { type RequestHandler } from 'express';
import { badEncoding, badUrl, notJson } from './http.errors';

const BODY_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
const strictUtf8 = new TextDecoder('utf-8', { fatal: true });

/** A path whose percent-encoding does not decode (`%E0%A4%A`, `%ZZ`) is a 400, before any route sees it. */
export function rejectMalformedUrl(): RequestHandler {
  return (req, _res, next) => {
    try {
      decodeURIComponent(req.path);
      next();
    } catch {
      next(badUrl());
    }
  };
}

/**
 * JSON bodies only: another content type is a 415 that says what to send, and bytes that are not
 * UTF-8 are a 400 instead of being decoded into replacement characters and stored. File uploads
 * (multipart) are let through on the paths `multipartAt` accepts; their route reads them.
 */
export function jsonBody({
  limit,
  multipartAt = () => false,
}: {
  limit: string;
  multipartAt?: (method: string, path: string) => boolean;
}): RequestHandler[] {
  const requireJson: RequestHandler = (req, _res, next) => {
    const hasBody =
      req.headers['transfer-encoding'] !== undefined || Number(req.headers['content-length'] ?? 0) > 0;
    const upload = req.is('multipart/form-data') && multipartAt(req.method, req.path);
    next(
      BODY_METHODS.has(req.method) && hasBody && !upload && !req.is('application/json')
        ? notJson()
        : undefined,
    );
  };
  const parse = express.json({
    limit,
    verify: (_req, _res, buffer) => {
      try {
        strictUtf8.decode(buffer);
      } catch {
        // body-parser passes a thrown error on with its own status when it has one.
        throw badEncoding();
      }
    },
  });
  return [requireJson, parse];
}
