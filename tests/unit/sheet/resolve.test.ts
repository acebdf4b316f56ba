import { describe, expect, it } from 'vitest';
import { resolveParameters, SheetIssuesError, sheetCellDependencies } from '@shared/sheet';
import { ouSheet, ouWith, sheet } from './fixtures';

describe('resolveParameters', () => {
  it('evaluates parameters in dependency order across params cells', () => {
    const doc = sheet([
      { id: 'late', kind: 'params', params: [{ name: 'c', value: 'a * b' }] },
      {
        id: 'early',
        kind: 'params',
        params: [
          { name: 'b', value: 'a + 1' },
          { name: 'a', value: 3 },
        ],
      },
    ]);
    expect(resolveParameters(doc)).toEqual({ a: 3, b: 4, c: 12 });
  });

  it('applies overrides, replacing expressions too', () => {
    const doc = sheet([
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'a', value: 3 },
          { name: 'b', value: 'a + 1' },
          { name: 'c', value: '2 * b' },
        ],
      },
    ]);
    expect(resolveParameters(doc, { a: 10 })).toEqual({ a: 10, b: 11, c: 22 });
    expect(resolveParameters(doc, { b: 0.5 })).toEqual({ a: 3, b: 0.5, c: 1 });
  });

  it('throws the parameter issues for a cycle', () => {
    const doc = sheet([
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'a', value: 'b' },
          { name: 'b', value: 'a' },
        ],
      },
    ]);
    expect(() => resolveParameters(doc)).toThrow(SheetIssuesError);
    expect(() => resolveParameters(doc)).toThrow(
      "the parameters: 1 problem: cell p, params[0].value: parameter 'a' depends on itself through b → a",
    );
  });

  it('throws for an override of an unknown parameter', () => {
    expect(() => resolveParameters(ouSheet(), { kappa: 1 })).toThrow(
      "there is no parameter 'kappa' to override",
    );
  });

  it('throws when an override makes a derived value non-finite', () => {
    const doc = sheet([
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'a', value: 3 },
          { name: 'b', value: '1 / a' },
        ],
      },
    ]);
    expect(() => resolveParameters(doc, { a: 0 })).toThrow(
      "parameter 'b' evaluates to Infinity, not a finite number",
    );
  });

  it('is not stopped by problems outside the params cells', () => {
    const doc = ouWith({ id: 'fan', kind: 'chart', simulation: 'nowhere', view: 'fan', state: 'x' });
    expect(resolveParameters(doc).theta).toBe(1.3);
  });
});

describe('sheetCellDependencies', () => {
  it('lists what each cell reads', () => {
    const doc = ouWith(
      { id: 'p2', kind: 'params', params: [{ name: 'k', value: 'theta * 2' }] },
      { id: 'p3', kind: 'params', params: [{ name: 'j', value: 1 }] },
      { id: 'study', kind: 'study', simulation: 'run' },
      { id: 'orphan', kind: 'chart', simulation: 'gone', view: 'fan', state: 'x' },
    );
    const deps = sheetCellDependencies(doc);
    expect(Object.fromEntries(deps)).toEqual({
      intro: [],
      p: [],
      p2: ['p'],
      p3: [],
      m: ['p', 'p2', 'p3'],
      run: ['m', 'p', 'p2', 'p3'],
      fan: ['run'],
      high: ['run'],
      study: ['run'],
      orphan: [],
    });
  });
});
