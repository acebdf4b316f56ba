import { describe, expect, it } from 'vitest';
import { symbolNameSchema } from '@shared/cells/fields';

function problem(name: string): string | null {
  const parsed = symbolNameSchema.safeParse(name);
  return parsed.success ? null : (parsed.error.issues[0]?.message ?? 'rejected');
}

describe('symbolNameSchema', () => {
  it.each(['θ', 'σ', 'μ', 'θ1', 'σ_x', 'Ω', 'λ_max', 'x', '_k', 'Kø', 'ж', 'δ2'])(
    'accepts the name %s: letters of any alphabet, digits 0–9 and "_"',
    (name) => {
      expect(problem(name)).toBeNull();
    },
  );

  it.each([
    ['θ₁', 'a subscript digit is not a letter'],
    ['x²', 'a superscript digit is not a letter'],
    ['1θ', 'a name cannot start with a digit'],
    ['x̄', 'a combining mark'],
    ['a\u200db', 'a zero-width joiner'],
    ['a\u200cb', 'a zero-width non-joiner'],
    ['a\u202eb', 'a bidi override'],
    ['x٣', 'a digit outside 0–9'],
    ['θ-1', 'a hyphen'],
    ['a b', 'a space'],
    ['x$', 'a dollar sign'],
    ['θ'.repeat(33), 'more than 32 characters'],
  ])('rejects %s (%s) and states the rule', (name) => {
    const message = problem(name);
    expect(message).not.toBeNull();
    expect(message).toMatch(/letter/);
    expect(message).toMatch(/0–9/);
    expect(message).toMatch(/subscript/);
  });

  it('counts the length in characters, not UTF-16 units', () => {
    // U+1D703 MATHEMATICAL ITALIC SMALL THETA is one letter but two UTF-16 units.
    expect(problem('\u{1d703}'.repeat(32))).toBeNull();
  });
});

describe('symbolNameSchema and the expression parser', () => {
  it('refuses U+2E2F, a letter the parser does not read as part of a name', () => {
    expect(problem('x\u2e2f')).not.toBeNull();
  });
});

describe('symbolNameSchema and invisible letters', () => {
  it('refuses a Hangul filler, a letter that shows nothing', () => {
    expect(problem('x\u3164')).not.toBeNull();
    expect(problem('\u3164')).not.toBeNull();
  });
});
