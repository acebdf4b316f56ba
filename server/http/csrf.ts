import type { RequestHandler } from 'express';
import { verifyRequestOrigin } from 'lucia';
import { API_ERROR_CODES } from '@shared/api/errors';
import { AppError } from './app-error';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request forgery guard: a state-changing request must carry an Origin header naming
 * this server (APP_ORIGIN when set, else the Host the request came to). Browsers always send
 * Origin on such requests; a form on another site cannot forge it.
 */
export function requireSameOrigin(appOrigin: string | undefined): RequestHandler {
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) {
      next();
      return;
    }
    const origin = req.get('origin');
    const allowed = appOrigin ?? (req.get('host') ? `http://${req.get('host')}` : undefined);
    if (!origin || !allowed || !verifyRequestOrigin(origin, [allowed])) {
      next(
        new AppError(
          403,
          API_ERROR_CODES.badOrigin,
          'This request did not come from a Meander page (bad or missing Origin).',
        ),
      );
      return;
    }
    next();
  };
}
