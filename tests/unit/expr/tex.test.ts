import { describe, expect, it } from 'vitest';
import { checkExpression, symbolTex, toTex, toTexFactor, type CheckedExpr } from '@shared/expr';

const SCOPE = ['a', 'b', 'c', 'x', 'theta', 'mu', 'sigma', 'θ', 'μ', 'σ', 'K', 'growth', 'x0', 'σ_x', 't'];

function tex(text: string): string {
  const checked = checkExpression(text, SCOPE);
  if (!checked.ok) throw new Error(checked.errors[0]?.message);
  return toTex(checked.tree);
}

describe('toTex', () => {
  it.each([
    ['theta * (mu - x)', String.raw`\theta\,\left(\mu - x\right)`],
    ['θ * (μ - x)', String.raw`\theta\,\left(\mu - x\right)`],
    ['a - (b + c)', String.raw`a - \left(b + c\right)`],
    ['a - b + c', 'a - b + c'],
    ['a - (b - c)', String.raw`a - \left(b - c\right)`],
    ['a + (b - c)', 'a + b - c'],
    ['x / (1 + x)', String.raw`\frac{x}{1 + x}`],
    ['-x / theta', String.raw`-\frac{x}{\theta}`],
    ['a + -x / theta', String.raw`a + \left(-\frac{x}{\theta}\right)`],
    ['2 * (-x / theta)', String.raw`2 \cdot \left(-\frac{x}{\theta}\right)`],
    ['(a + b) ** 2', String.raw`\left(a + b\right)^{2}`],
    ['x ** -1', 'x^{-1}'],
    ['(-x) ** 2', String.raw`\left(-x\right)^{2}`],
    ['x ** 2 ** 3', 'x^{2^{3}}'],
    ['(x ** 2) ** 3', String.raw`\left(x^{2}\right)^{3}`],
    ['2 * x', String.raw`2\,x`],
    ['x * 2', String.raw`x \cdot 2`],
    ['a * -b', String.raw`a \cdot \left(-b\right)`],
    ['a + -b', String.raw`a + \left(-b\right)`],
    ['-(a + b)', String.raw`-\left(a + b\right)`],
    ['-a * b', String.raw`-a\,b`],
    ['a * b / c', String.raw`\frac{a\,b}{c}`],
    ['sqrt(abs(x))', String.raw`\sqrt{\left|x\right|}`],
    ['exp(-x)', String.raw`\exp\left(-x\right)`],
    ['log(x)', String.raw`\ln\left(x\right)`],
    ['sin(x) ** 2', String.raw`\left(\sin\left(x\right)\right)^{2}`],
    ['pow(a + b, 2)', String.raw`\left(a + b\right)^{2}`],
    ['min(a, b)', String.raw`\min\left(a, b\right)`],
    ['pos(x)', String.raw`\left(x\right)^{+}`],
    ['floor(x)', String.raw`\left\lfloor x\right\rfloor`],
    ['atan2(a, b)', String.raw`\operatorname{atan2}\left(a, b\right)`],
    ['pi', String.raw`\pi`],
    ['1e-7', String.raw`1 \times 10^{-7}`],
    ['2.5e+21', String.raw`2.5 \times 10^{21}`],
    ['0.5', '0.5'],
    ['a <= b && !c', String.raw`a \le b \land \lnot c`],
    ['a != b || c == 1', String.raw`a \ne b \lor c = 1`],
    ['x > 0 ? x : 0', String.raw`\begin{cases} x & \text{if } x > 0 \\ 0 & \text{otherwise} \end{cases}`],
    [
      '1 + (x > 0 ? x : 0)',
      String.raw`1 + \left(\begin{cases} x & \text{if } x > 0 \\ 0 & \text{otherwise} \end{cases}\right)`,
    ],
    ['growth * K', String.raw`\mathrm{growth}\,K`],
    ['σ_x * x0', String.raw`\sigma_{x}\,x_{0}`],
  ])('typesets %s as %s', (text, expected) => {
    expect(tex(text)).toBe(expected);
  });

  it('refuses a tree that checkExpression could not have made', () => {
    const forged = { root: { kind: 'source', text: '\\href{x}{y}' }, names: [] } as unknown as CheckedExpr;
    expect(() => toTex(forged)).toThrow(/not an expression node/);
    const badOp = {
      root: {
        kind: 'arithmetic',
        op: '%',
        left: { kind: 'number', value: 1 },
        right: { kind: 'number', value: 2 },
      },
      names: [],
    } as unknown as CheckedExpr;
    expect(() => toTex(badOp)).toThrow(/operator/);
  });
});

describe('symbolTex', () => {
  it.each([
    ['θ', String.raw`\theta`],
    ['Ω', String.raw`\Omega`],
    ['Α', 'A'],
    ['ϑ', String.raw`\vartheta`],
    ['sigma', String.raw`\sigma`],
    ['Sigma', String.raw`\Sigma`],
    ['sigma2', String.raw`\sigma_{2}`],
    ['σ_x', String.raw`\sigma_{x}`],
    ['x0', 'x_{0}'],
    ['X12', 'X_{12}'],
    ['K', 'K'],
    ['growth', String.raw`\mathrm{growth}`],
    ['r_max', String.raw`r_{\mathrm{max}}`],
    ['ж', String.raw`\text{ж}`],
    ['_k', String.raw`\mathrm{\_k}`],
    ['a_b_c', String.raw`a_{\mathrm{b\_c}}`],
  ])('writes the name %s as %s', (name, expected) => {
    expect(symbolTex(name)).toBe(expected);
  });

  it('never lets a TeX command or special character through from a name', () => {
    for (const name of ['\\href', 'x$y', 'a^b', 'x%y', 'a#b', 'a&b', 'x~y'])
      expect(symbolTex(name)).not.toMatch(/[$%#&~^]|\\href/);
    expect(symbolTex('a{b}')).toBe(String.raw`\mathrm{a?b?}`);
  });
});

describe('toTexFactor', () => {
  it.each([
    ['theta * (mu - x)', String.raw`\theta\,\left(\mu - x\right)`],
    ['mu - x', String.raw`\left(\mu - x\right)`],
    ['-x', '-x'],
    [
      'x > 0 ? x : 0',
      String.raw`\left(\begin{cases} x & \text{if } x > 0 \\ 0 & \text{otherwise} \end{cases}\right)`,
    ],
  ])('brackets %s only when it binds more loosely than a product', (text, expected) => {
    const checked = checkExpression(text, SCOPE);
    expect(checked.ok && toTexFactor(checked.tree)).toBe(expected);
  });
});
