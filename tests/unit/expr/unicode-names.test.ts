import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { checkExpression, evaluate, generateSource } from '@shared/expr';
import { buildSimulationPlan } from '@shared/sheet';
import { sheet } from '../sheet/fixtures';

// Greek and other Unicode letters are names a modeller writes; they must parse, evaluate, and
// never reach generated code, which stays plain ASCII built from the checked tree.
const ASCII_ONLY = /^[\x20-\x7e]*$/;

function greekSheet() {
  return sheet([
    {
      id: 'p',
      kind: 'params',
      params: [
        { name: 'θ', value: 1.5 },
        { name: 'μ', value: 0.2 },
        { name: 'σ', value: 0.3 },
        { name: 'X₀'.replace('₀', '0'), value: '2 * μ' },
      ],
    },
    {
      id: 'm',
      kind: 'model',
      states: [{ name: 'Ψ', initial: 'X0', drift: 'θ * (μ - Ψ)', diffusion: { Wσ: 'σ * sqrt(abs(Ψ))' } }],
      noises: [{ name: 'Wσ' }],
    },
    { id: 'run', kind: 'simulation', model: 'm', t1: 1, stepSize: 0.01, paths: 10, seed: 3 },
  ]);
}

describe('Unicode letters in names', () => {
  it('checks and evaluates an expression written with Greek names', () => {
    const checked = checkExpression('θ * (μ - x) + σ', ['θ', 'μ', 'σ', 'x']);
    expect(checked.ok).toBe(true);
    if (!checked.ok) return;
    expect(checked.tree.names).toEqual(['x', 'θ', 'μ', 'σ']);
    // 1.5 · (0.2 − 1) + 0.3 = −0.9 (hand computed)
    expect(evaluate(checked.tree, { θ: 1.5, μ: 0.2, σ: 0.3, x: 1 })).toBeCloseTo(-0.9, 14);
  });

  it('builds a plan whose generated sources are ASCII only, the names replaced', () => {
    const plan = buildSimulationPlan(greekSheet(), 'run');
    const sources = [...plan.model.drift, ...plan.model.diffusion.flat()];
    for (const source of sources) {
      expect(source).toMatch(ASCII_ONLY);
      expect(source).not.toMatch(/θ|μ|σ|Ψ/);
    }
    expect(plan.model.stateNames).toEqual(['Ψ']);
    expect(plan.model.noiseNames).toEqual(['Wσ']);
    expect(plan.model.initial[0]).toBeCloseTo(0.4, 14); // 2 · 0.2
  });

  it('says to retype a name written with a combining accent when the composed one is in scope', () => {
    const result = checkExpression('e\u0301 + 1', ['\u00e9']);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors[0]?.message).toMatch(/combining/);
  });
});

describe('Unicode tricks at the security boundary', () => {
  let functionSpy: ReturnType<typeof vi.spyOn>;
  beforeEach(() => {
    functionSpy = vi.spyOn(globalThis, 'Function');
  });
  afterEach(() => vi.restoreAllMocks());

  const SCOPE = ['x', 'ab', 'θ', 'constructor'];
  it.each([
    ['\\u0063onstructor', /escape/],
    ['\\u{63}onstructor', /escape/],
    ['\\u03b8 + 1', /escape/],
    ['\\u{3b8} * x', /escape/],
    ['x.\\u0063onstructor', /property access|escape/],
    ['a\u200db', /invisible|U\+200D/],
    ['a\u200cb', /invisible|U\+200C/],
    ['x\u200b + 1', /invisible|U\+200B/],
    ['x + 1 \u202e 2 +', /invisible|U\+202E/],
    ['\u2066x\u2069', /invisible|U\+2066/],
    ['\ufeffx', /invisible|U\+FEFF/],
    ['x\u00ad', /invisible|U\+00AD/],
    ['θ\u034f', /invisible|U\+034F/],
  ])('rejects %s with a clear message and runs nothing', (text, message) => {
    const result = checkExpression(text, SCOPE);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors.map((e) => e.message).join(' | ')).toMatch(message);
    expect(functionSpy).not.toHaveBeenCalled();
  });

  it('treats a look-alike letter as a different, unknown name', () => {
    // Cyrillic а (U+0430) looks like Latin a: a different name, reported as unknown.
    const result = checkExpression('\u0430b', SCOPE);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors[0]?.message).toMatch(/unknown name/);
  });
});

describe('generateSource replacements', () => {
  it.each([
    ['a Unicode name copied as its own replacement', 'θ'],
    ['a property access', 's0.constructor'],
    ['a call', 'alert(1)'],
    ['an escape', '\\u0073'],
  ])('refuses %s', (_what, replacement) => {
    const checked = checkExpression('θ + 1', ['θ']);
    expect(checked.ok).toBe(true);
    if (checked.ok) expect(() => generateSource(checked.tree, { θ: replacement })).toThrow(/replacement/);
  });
});
