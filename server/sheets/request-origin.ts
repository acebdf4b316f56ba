import type { Request } from 'express';

/** The origin links in mail start with: APP_ORIGIN when set, else where the request came to. */
export function requestOrigin(req: Request, appOrigin: string | undefined): string {
  return appOrigin ?? `${req.protocol}://${req.get('host') ?? 'localhost'}`;
}
