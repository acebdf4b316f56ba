/**
 * Whether an error means PostgreSQL cannot be reached or is going away, rather than a fault in
 * the query: connection refused or reset, a timeout while connecting, the server shutting down
 * (SQLSTATE class 08 and 57P01–57P03, PostgreSQL's errcodes appendix). Drizzle wraps the
 * driver's error in `cause`, so the chain is followed.
 */
const NETWORK_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENOTFOUND',
  'EPIPE',
]);
const SERVER_CODES = new Set(['57P01', '57P02', '57P03', '53300']);
const DRIVER_MESSAGES =
  /Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error/i;

export function isDatabaseUnavailable(error: unknown): boolean {
  for (let current = error, depth = 0; current && typeof current === 'object' && depth < 5; depth += 1) {
    const code = 'code' in current && typeof current.code === 'string' ? current.code : '';
    if (NETWORK_CODES.has(code) || SERVER_CODES.has(code) || code.startsWith('08')) return true;
    if (current instanceof AggregateError && current.errors.some(isDatabaseUnavailable)) return true;
    if (current instanceof Error && DRIVER_MESSAGES.test(current.message)) return true;
    current = 'cause' in current ? current.cause : undefined;
  }
  return false;
}
