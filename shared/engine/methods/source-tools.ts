import type { ModelSpec } from '../plan';

/**
 * Small helpers over the expression sources of a plan. The sources are produced by the
 * expression compiler from checked trees, so their only identifiers are t, s0…, w0…, f_ helpers
 * and Math members; renaming by pattern is therefore safe.
 */

/** True when a coefficient source is the literal zero (a state that does not feel a noise). */
export function isZeroSource(source: string): boolean {
  const bare = source.replace(/[()\s]/g, '');
  return bare !== '' && Number(bare) === 0;
}

const STATE_OR_TIME = /(?<![\w$.])(s\d+|t)(?![\w$])/g;

/** Replaces s{i} by `${statePrefix}{i}` and t by `time` in a source. */
export function renameStateAndTime(source: string, statePrefix: string, time: string): string {
  return source.replace(STATE_OR_TIME, (name) => (name === 't' ? time : `${statePrefix}${name.slice(1)}`));
}

/** Indices of the states a source mentions. */
export function statesMentioned(source: string): number[] {
  const found = new Set<number>();
  for (const match of source.matchAll(/(?<![\w$.])s(\d+)(?![\w$])/g)) found.add(Number(match[1]));
  return [...found].sort((a, b) => a - b);
}

/** Whether the noise is scalar (m = 1) or diagonal (m = d, b_ij = 0 off the diagonal). */
export function noiseShape(model: ModelSpec): 'none' | 'scalar' | 'diagonal' | 'general' {
  const m = model.noiseNames.length;
  if (m === 0) return 'none';
  if (m === 1) return 'scalar';
  const d = model.stateNames.length;
  if (m !== d) return 'general';
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < m; j++) if (i !== j && !isZeroSource(model.diffusion[i]![j]!)) return 'general';
  }
  return 'diagonal';
}

/** Parenthesised source, so it can be multiplied safely. */
export function wrap(source: string): string {
  return `(${source})`;
}

export interface StepSource {
  /** Names of temporaries the step uses (declared once by the kernel with `let`). */
  temporaries: string[];
  /**
   * Statements that, with t (time at the start of the step), tn (time at its end), h, sqh = √h,
   * s0… (state) and dw0… (increments of the noise sources) in scope, leave the new state in n0….
   */
  body: string;
}
