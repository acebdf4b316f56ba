import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';

/**
 * One structured line per request (pino-http): a request id of our own (also sent back as
 * X-Request-Id, so a user's report can be found), method, path, status, time taken. Never
 * headers (cookies, authorisation), bodies (passwords) or query strings (a reset link's token
 * arrives in one): only what the serializers below pick out.
 */
export function requestLog(logger: Logger): RequestHandler {
  return pinoHttp({
    logger,
    // A client's X-Request-Id is not taken over: ids stay unique and cannot be forged into the log.
    genReqId: (_req, res) => {
      const id = randomUUID();
      res.setHeader('X-Request-Id', id);
      return id;
    },
    serializers: {
      req: (req: { id: unknown; method: string; url: string; remoteAddress?: string }) => ({
        id: req.id,
        method: req.method,
        url: req.url.split('?')[0],
        remoteAddress: req.remoteAddress,
      }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
    customLogLevel: (_req, res, error) =>
      error || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info',
  });
}
