import { parseExpressionAt, type Expression } from 'acorn';
import { firstInvisibleCharacter } from './invisible';
import { MAX_EXPRESSION_DEPTH, MAX_EXPRESSION_LENGTH } from './limits';
import type { ExprError } from './tree';

export type ParseResult = { ok: true; node: Expression } | { ok: false; errors: ExprError[] };

/**
 * Parses the text as one JavaScript expression with acorn, after the checks that must come before
 * any parsing (length, emptiness, bracket depth), and rejects comments and trailing text. The
 * result is acorn's tree, still unchecked: check.ts decides what of it is allowed.
 */
export function parseExpressionText(text: string): ParseResult {
  const early = checkBeforeParsing(text);
  if (early) return { ok: false, errors: [early] };

  const errors: ExprError[] = [];
  let node: Expression;
  try {
    node = parseExpressionAt(text, 0, {
      ecmaVersion: 2022,
      sourceType: 'script',
      // Keeps brackets as nodes, so the root's end is the true end of the expression text.
      preserveParens: true,
      onComment: (_block, _content, start, end) => {
        errors.push({ from: start, to: end, message: 'comments are not allowed in expressions' });
      },
    });
  } catch (error) {
    return { ok: false, errors: [...errors, fromParserError(text, error)] };
  }

  const rest = firstNonSpace(text, node.end);
  if (rest < text.length && !errors.some((e) => e.from <= rest && rest < e.to)) {
    errors.push({
      from: rest,
      to: text.length,
      message: `unexpected text after the expression: ${quoteSlice(text, rest)}`,
    });
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, node };
}

function checkBeforeParsing(text: string): ExprError | null {
  if (text.length > MAX_EXPRESSION_LENGTH) {
    return {
      from: MAX_EXPRESSION_LENGTH,
      to: text.length,
      message: `an expression is at most ${MAX_EXPRESSION_LENGTH} characters; this one has ${text.length}`,
    };
  }
  if (text.trim() === '') return { from: 0, to: text.length, message: 'the expression is empty' };
  const invisible = firstInvisibleCharacter(text);
  if (invisible) {
    return {
      from: invisible.at,
      to: invisible.at + invisible.length,
      message: `an invisible character (${invisible.codePoint}) is not allowed in an expression: delete it`,
    };
  }
  // Counted on the raw text so that hostile nesting never reaches the recursive parser.
  let depth = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === '(' || c === '[' || c === '{') {
      depth++;
      if (depth > MAX_EXPRESSION_DEPTH) {
        return {
          from: i,
          to: i + 1,
          message: `brackets are nested more than ${MAX_EXPRESSION_DEPTH} levels deep`,
        };
      }
    } else if (c === ')' || c === ']' || c === '}') {
      depth = Math.max(0, depth - 1);
    }
  }
  return null;
}

interface AcornSyntaxError extends SyntaxError {
  pos: number;
  raisedAt: number;
}

function isAcornSyntaxError(error: unknown): error is AcornSyntaxError {
  return error instanceof SyntaxError && typeof (error as Partial<AcornSyntaxError>).pos === 'number';
}

function fromParserError(text: string, error: unknown): ExprError {
  if (error instanceof RangeError) {
    return { from: 0, to: text.length, message: 'the expression is nested too deeply' };
  }
  if (!isAcornSyntaxError(error)) throw error;
  const from = Math.min(error.pos, text.length);
  const to = Math.min(Math.max(error.raisedAt, from + 1), text.length);
  if (from >= text.length) {
    return { from: Math.max(0, text.length - 1), to: text.length, message: 'the expression ends too early' };
  }
  if (text.startsWith('**', from) && /-\s*[\w.(]/.test(text.slice(0, from))) {
    return {
      from,
      to: from + 2,
      message: 'a minus sign before ** needs brackets: write (-a) ** b or -(a ** b)',
    };
  }
  if (/rvalue|left-hand side/i.test(error.message)) {
    return {
      from,
      to,
      message:
        '=, ++ and -- cannot change a value here; to compare, use ==, and to negate twice, write -(-x)',
    };
  }
  if (text.startsWith('...', from))
    return { from, to: from + 3, message: 'spread (...) is not allowed in expressions' };
  // Acorn appends "(line:column)"; the position is reported separately.
  const detail = error.message.replace(/\s*\(\d+:\d+\)$/, '');
  return {
    from,
    to,
    message: `cannot read the expression here: ${detail.charAt(0).toLowerCase()}${detail.slice(1)}`,
  };
}

function firstNonSpace(text: string, from: number): number {
  let i = from;
  while (i < text.length && /\s/.test(text[i] ?? '')) i++;
  return i;
}

function quoteSlice(text: string, from: number): string {
  const slice = text.slice(from, from + 20);
  return `'${slice}${text.length > from + 20 ? '…' : ''}'`;
}
