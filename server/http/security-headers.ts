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

/**
 * The worker may run the engine's generated code (JavaScript, and the wasm kernel it compiles:
 * 'wasm-unsafe-eval'), and may open no connection at all: even code that escaped the expression
 * whitelist could not call the API or send anything away.
 */
export const WORKER_CSP = PAGE_CSP.replace(
  "script-src 'self'",
  "script-src 'self' 'unsafe-eval' 'wasm-unsafe-eval'",
).replace("connect-src 'self'", "connect-src 'none'");

/** Worker bundles as Vite names them (`assets/simulation.worker-abc123.js`). */
export const WORKER_SCRIPT_PATTERN = /^\/assets\/[^/]*worker[^/]*\.js$/;

/** Powerful features Meander never uses, turned off for the page and anything it embeds. */
export const PERMISSIONS_POLICY = [
  'accelerometer',
  'camera',
  'display-capture',
  'geolocation',
  'gyroscope',
  'hid',
  'magnetometer',
  'microphone',
  'midi',
  'payment',
  'picture-in-picture',
  'publickey-credentials-get',
  'screen-wake-lock',
  'serial',
  'usb',
  'xr-spatial-tracking',
]
  .map((feature) => `${feature}=()`)
  .join(', ');

/**
 * Besides the CSP: cross-origin isolation (COOP same-origin and COEP require-corp), so the page
 * may share memory with its workers (SharedArrayBuffer: the pool's cancel flag and chunk
 * counter); every subresource is our own, so require-corp blocks nothing we load.
 */
export function securityHeaders(): RequestHandler {
  return (req, res, next) => {
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Referrer-Policy', 'same-origin');
    res.setHeader('Content-Security-Policy', WORKER_SCRIPT_PATTERN.test(req.path) ? WORKER_CSP : PAGE_CSP);
    res.setHeader('X-Frame-Options', 'DENY');
    res.setHeader('Cross-Origin-Opener-Policy', 'same-origin');
    res.setHeader('Cross-Origin-Embedder-Policy', 'require-corp');
    res.setHeader('Cross-Origin-Resource-Policy', 'same-origin');
    res.setHeader('Permissions-Policy', PERMISSIONS_POLICY);
    next();
  };
}

/** API answers carry accounts and sheets: never kept by a browser or a shared cache. */
export function noStore(): RequestHandler {
  return (_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  };
}
