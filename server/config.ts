import path from 'node:path';
import { z } from 'zod';
import { LOG_LEVELS } from './logger';

const port = z.coerce.number().int().min(1).max(65_535);
const flag = z.enum(['true', 'false', '1', '0']).transform((value) => value === 'true' || value === '1');

/** The environment the server reads, checked once at boot. */
export const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: port.default(3000),
  /** Address to listen on; loopback unless told otherwise. */
  HOST: z.string().min(1).default('127.0.0.1'),
  API_PORT: port.default(3001),
  /** When unset, `npm start` runs its own PostgreSQL under .data/pg. */
  DATABASE_URL: z
    .url({ protocol: /^postgres(ql)?$/, error: 'DATABASE_URL must be a postgres:// URL' })
    .optional(),
  PGPORT_MEANDER: port.default(54329),
  /**
   * The public origin (scheme://host:port): reset links, the Origin check and the Host check use
   * it, never a request's headers. Defaults to http://HOST:PORT of the server itself.
   */
  APP_ORIGIN: z
    .url({
      protocol: /^https?$/,
      error: 'APP_ORIGIN must be an http(s) origin such as http://localhost:3000',
    })
    .transform((value) => new URL(value).origin)
    .optional(),
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  SMTP_PORT: port.default(2525),
  MAIL_FROM: z.string().min(3).default('Meander <no-reply@meander.example.test>'),
  /** Secure cookies; defaults to on in production. */
  SESSION_SECURE: flag.optional(),
  /** Structured logs (JSON lines on stdout) from this level up. */
  LOG_LEVEL: z.enum(LOG_LEVELS).default('info'),
  /**
   * Express's `trust proxy`: which proxies may name the client in X-Forwarded-For (rate limits
   * and logs use it). `false` (default), `true`, a hop count, or addresses and subnets such as
   * `loopback` or `10.0.0.0/8, 10.1.2.3`.
   */
  TRUST_PROXY: z
    .string()
    .trim()
    .min(1)
    .transform((value): boolean | number | string =>
      value === 'true' ? true : value === 'false' ? false : /^\d+$/.test(value) ? Number(value) : value,
    )
    .optional(),
});

export type Env = z.infer<typeof envSchema>;

/** What createApp needs, independent of where it came from. */
export interface AppConfig {
  nodeEnv: Env['NODE_ENV'];
  /** scheme://host[:port], as URL.origin writes it. */
  appOrigin: string;
  secureCookies: boolean;
  /** Express's `trust proxy` setting; false unless TRUST_PROXY says otherwise. */
  trustProxy?: boolean | number | string;
  /** Built client to serve (dist/); omitted in tests and in `npm run dev`. */
  clientDir?: string;
}

/** Parses the environment or throws one message listing every problem. */
export function loadEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const result = envSchema.safeParse(source);
  if (result.success) return result.data;
  const problems = result.error.issues
    .map((issue) => `  ${issue.path.join('.')}: ${issue.message}`)
    .join('\n');
  throw new Error(`The environment is not valid:\n${problems}`);
}

/** http://HOST:PORT; a wildcard address is reached as localhost (set APP_ORIGIN on a public server). */
export function defaultOrigin(host: string, port: number): string {
  const reachable = host === '0.0.0.0' || host === '::' ? 'localhost' : host;
  return new URL(`http://${reachable.includes(':') ? `[${reachable}]` : reachable}:${port}`).origin;
}

export function appConfigFromEnv(env: Env, clientDir?: string): AppConfig {
  return {
    nodeEnv: env.NODE_ENV,
    appOrigin: env.APP_ORIGIN ?? defaultOrigin(env.HOST, env.PORT),
    secureCookies: env.SESSION_SECURE ?? env.NODE_ENV === 'production',
    trustProxy: env.TRUST_PROXY ?? false,
    clientDir: clientDir ? path.resolve(clientDir) : undefined,
  };
}
