import { describe, expect, it } from 'vitest';
import { expressionCompletions, expressionDiagnostics } from '@/components/cells/expressionDiagnostics';
import type { ScopeName } from '@/components/cells/expressionCheck';

const scope: ScopeName[] = [
  { name: 'growth', kind: 'parameter' },
  { name: 'N', kind: 'state' },
  { name: 't', kind: 'time' },
];

describe('expression diagnostics', () => {
  it('finds nothing wrong with a valid drift', () => {
    expect(expressionDiagnostics('growth * N * (1 - N / 100) + sin(t)', scope)).toEqual([]);
  });

  it('marks ^ at its position and says to use **', () => {
    const text = 'growth * N ^ 2';
    const [d] = expressionDiagnostics(text, scope);
    expect(d).toBeDefined();
    expect(d!.message).toMatch(/\*\*/);
    expect(text.slice(d!.from, d!.to)).toContain('^');
  });

  it('marks an unknown name exactly where it stands', () => {
    const text = 'growth * M';
    const [d] = expressionDiagnostics(text, scope);
    expect(text.slice(d!.from, d!.to)).toBe('M');
  });

  it('rejects calls outside the whitelist', () => {
    const diagnostics = expressionDiagnostics('fetch(1)', scope);
    expect(diagnostics.length).toBeGreaterThan(0);
    expect(diagnostics[0]!.severity).toBe('error');
  });

  it('keeps every range inside the text and at least one character wide', () => {
    for (const text of ['growth *', '(N', 'N +', '1 +* 2']) {
      for (const d of expressionDiagnostics(text, scope)) {
        expect(d.from).toBeGreaterThanOrEqual(0);
        expect(d.to).toBeLessThanOrEqual(text.length);
        expect(d.to).toBeGreaterThan(d.from);
      }
    }
  });

  it('asks for an expression when blank, unless the field is optional', () => {
    expect(expressionDiagnostics('  ', scope)).toHaveLength(1);
    expect(expressionDiagnostics('', scope, { allowEmpty: true })).toEqual([]);
  });

  it('completes names in scope first, then functions with their docs', () => {
    const completions = expressionCompletions(scope);
    expect(completions[0]).toMatchObject({ label: 'growth', type: 'variable' });
    const exp = completions.find((c) => c.label === 'exp');
    expect(exp).toMatchObject({ type: 'function' });
    expect(exp!.info).toMatch(/exp\(x\)/);
    expect(completions.find((c) => c.label === 'pi')).toMatchObject({ type: 'constant' });
  });
});
