import { BUILTIN_NAMES, expressionProblems, type ScopeName } from './expressionCheck';

/** A problem marked in the editor: the shape @codemirror/lint draws, without importing CodeMirror. */
export interface ExpressionDiagnostic {
  from: number;
  to: number;
  severity: 'error';
  message: string;
}

/**
 * Diagnostics for an expression field. Positions come from the shared checker; they are clamped
 * into the text and widened to at least one character where possible, so a problem "at the end"
 * (a missing operand) is still visible as an underline.
 */
export function expressionDiagnostics(
  text: string,
  scope: readonly ScopeName[],
  options: { allowEmpty?: boolean } = {},
): ExpressionDiagnostic[] {
  if (text.trim() === '') {
    if (options.allowEmpty) return [];
    return [
      {
        from: 0,
        to: text.length,
        severity: 'error',
        message: 'An expression is needed here (write 0 for none).',
      },
    ];
  }
  return expressionProblems(text, scope).map((problem) => {
    let from = clamp(problem.from, 0, text.length);
    let to = clamp(problem.to, from, text.length);
    if (to === from) {
      if (to < text.length) to += 1;
      else if (from > 0) from -= 1;
    }
    return { from, to, severity: 'error', message: problem.message };
  });
}

export interface ExpressionCompletion {
  label: string;
  type: 'variable' | 'constant' | 'function';
  detail?: string;
  info?: string;
}

/** Completions for a field: the names in scope first, then the constants and functions with their docs. */
export function expressionCompletions(scope: readonly ScopeName[]): ExpressionCompletion[] {
  const seen = new Set<string>();
  const completions: ExpressionCompletion[] = [];
  for (const entry of [...scope, ...BUILTIN_NAMES]) {
    if (seen.has(entry.name)) continue;
    seen.add(entry.name);
    if (entry.kind === 'function')
      completions.push({ label: entry.name, type: 'function', info: entry.detail });
    else if (entry.kind === 'constant')
      completions.push({ label: entry.name, type: 'constant', info: entry.detail });
    else completions.push({ label: entry.name, type: 'variable', detail: entry.detail ?? entry.kind });
  }
  return completions;
}

function clamp(value: number, low: number, high: number): number {
  return Math.min(Math.max(Number.isFinite(value) ? value : low, low), high);
}
