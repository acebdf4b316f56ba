import type { RequestHandler } from 'express';
import { badOrigin, unknownHost } from './http.errors';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const LOOPBACK_NAMES = ['127.0.0.1', 'localhost'];

/**
 * The origins this server answers to: the configured one, and when that is a loopback name, the
 * other loopback name with the same scheme and port (a developer may open either). Nothing is
 * ever taken from a request's headers.
 */
export function allowedOrigins(appOrigin: string): string[] {
  const url = new URL(appOrigin);
  if (!LOOPBACK_NAMES.includes(url.hostname)) return [url.origin];
  return LOOPBACK_NAMES.map((name) => {
    const alias = new URL(url.origin);
    alias.hostname = name;
    return alias.origin;
  });
}

/**
 * Answers 421 to a request whose Host header names none of our origins' hosts: a page on a
 * domain that an attacker re-pointed at this address (DNS rebinding) cannot talk to the app.
 * The Host header is read raw, never through X-Forwarded-Host: a proxy must pass Host on.
 */
export function requireKnownHost(origins: readonly string[]): RequestHandler {
  const hosts = new Set(origins.map((origin) => new URL(origin).host));
  return (req, _res, next) => {
    const host = (req.headers.host ?? '').toLowerCase();
    next(hosts.has(host) ? undefined : unknownHost());
  };
}

/**
 * Cross-site request forgery guard: a state-changing request must carry an Origin header equal
 * to one of ours, scheme, host and port alike. Browsers always send Origin on such requests; a
 * form on another site cannot forge it.
 */
export function requireSameOrigin(origins: readonly string[]): RequestHandler {
  const allowed = new Set(origins);
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) {
      next();
      return;
    }
    next(allowed.has(req.get('origin') ?? '') ? undefined : badOrigin());
  };
}
