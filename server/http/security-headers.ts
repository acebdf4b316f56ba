import type { RequestHandler } from 'express';

/**
 * The page may not evaluate strings as code: only the simulation worker compiles generated code,
 * and a worker's policy comes from its own response headers (see WORKER_CSP).
 */
export const PAGE_CSP = [
  "default-src 'self'",
  "script-src 'self'",
  "worker-src 'self' blob:",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self' data:",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "frame-ancestors 'none'",
].join('; ');

export const WORKER_CSP = PAGE_CSP.replace("script-src 'self'", "script-src 'self' 'unsafe-eval'");

/** Worker bundles as Vite names them (`assets/simulation.worker-abc123.js`). */
export const WORKER_SCRIPT_PATTERN = /^\/assets\/[^/]*worker[^/]*\.js$/;

export function securityHeaders(): RequestHandler {
  return (req, res, next) => {
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Referrer-Policy', 'same-origin');
    res.setHeader('Content-Security-Policy', WORKER_SCRIPT_PATTERN.test(req.path) ? WORKER_CSP : PAGE_CSP);
    res.setHeader('X-Frame-Options', 'DENY');
    next();
  };
}
