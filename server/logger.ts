import { pino, type Logger } from 'pino';

export type { Logger };

export const LOG_LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'] as const;

/** JSON lines on stdout, one per event; the level from LOG_LEVEL. */
export function createLogger(level: (typeof LOG_LEVELS)[number] = 'info'): Logger {
  return pino({ level, base: { service: 'meander' } });
}

/** For tests and tools: nothing is written. */
export const silentLogger: Logger = pino({ level: 'silent' });

/**
 * What the log keeps of an unexpected error: name, code, message and stack, without the query
 * parameters Drizzle puts in its messages (`params: …` can hold password hashes and tokens'
 * hashes), and the same for its cause.
 */
export function loggableError(error: unknown, depth = 0): Record<string, unknown> {
  if (!(error instanceof Error)) return { message: String(error).replace(PARAMS, '') };
  const code = (error as { code?: unknown }).code;
  return {
    type: error.name,
    ...(typeof code === 'string' ? { code } : {}),
    message: error.message.replace(PARAMS, ''),
    stack: error.stack?.replace(PARAMS, ''),
    ...(error.cause !== undefined && depth < 3 ? { cause: loggableError(error.cause, depth + 1) } : {}),
  };
}

const PARAMS = /\n?params: [^\n]*/g;
