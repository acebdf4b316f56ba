export type RateLimitDecision = { allowed: true } | { allowed: false; retryAfterSeconds: number };

export interface RateLimiterOptions {
  /** Attempts allowed per window and key. */
  limit: number;
  windowMs: number;
  now?: () => number;
}

/**
 * Fixed-window counter per key, in memory (one process serves the API). Passed in, so tests and
 * a future shared store can replace it.
 */
export function createRateLimiter({ limit, windowMs, now = Date.now }: RateLimiterOptions) {
  const windows = new Map<string, { count: number; resetsAt: number }>();

  function prune(at: number) {
    for (const [key, window] of windows) if (window.resetsAt <= at) windows.delete(key);
  }

  return {
    consume(key: string): RateLimitDecision {
      const at = now();
      if (windows.size > 10_000) prune(at);
      let window = windows.get(key);
      if (!window || window.resetsAt <= at) {
        window = { count: 0, resetsAt: at + windowMs };
        windows.set(key, window);
      }
      if (window.count >= limit) {
        return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil((window.resetsAt - at) / 1000)) };
      }
      window.count += 1;
      return { allowed: true };
    },
    reset(key: string) {
      windows.delete(key);
    },
  };
}

export type RateLimiter = ReturnType<typeof createRateLimiter>;

/** Sign-in attempts: 10 per 15 minutes per client address and e-mail (common practice, no source). */
export const SIGN_IN_LIMIT = { limit: 10, windowMs: 15 * 60 * 1000 };
