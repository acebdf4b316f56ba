import jStat from 'jstat';

/**
 * Standardised residuals against N(0, 1): the Kolmogorov–Smirnov statistic D with its p-value
 * from the asymptotic Kolmogorov distribution with Stephens' small-sample factor,
 * Q((√n + 0.12 + 0.11/√n) D), Q(λ) = 2 Σ (−1)^{k−1} e^{−2k²λ²} (Stephens 1970, JRSS B 32,
 * 115–122; Press et al., Numerical Recipes, §14.3). The normal CDF and quantiles come from
 * jstat. With parameters estimated from the same data the p-value is conservative (Lilliefors
 * 1967): a small one is a real warning, a large one no proof of fit.
 */
export interface ResidualCheck {
  count: number;
  ksStatistic: number | null;
  ksPValue: number | null;
  qq: [number, number][];
}

export const MAX_QQ_POINTS = 200;

function kolmogorovSurvival(lambda: number): number {
  if (lambda < 0.2) return 1;
  let sum = 0;
  for (let k = 1; k <= 100; k++) {
    const term = (k % 2 === 1 ? 2 : -2) * Math.exp(-2 * k * k * lambda * lambda);
    sum += term;
    if (Math.abs(term) < 1e-12) break;
  }
  return Math.min(1, Math.max(0, sum));
}

export function residualCheck(residuals: ArrayLike<number>): ResidualCheck {
  const sorted = Float64Array.from(Array.from(residuals).filter(Number.isFinite)).sort();
  const n = sorted.length;
  if (n < 2) return { count: n, ksStatistic: null, ksPValue: null, qq: [] };
  let d = 0;
  for (let i = 0; i < n; i++) {
    const cdf = jStat.normal.cdf(sorted[i]!, 0, 1);
    d = Math.max(d, (i + 1) / n - cdf, cdf - i / n);
  }
  const root = Math.sqrt(n);
  const pValue = kolmogorovSurvival((root + 0.12 + 0.11 / root) * d);
  const every = Math.max(1, Math.ceil(n / MAX_QQ_POINTS));
  const qq: [number, number][] = [];
  for (let i = 0; i < n; i += every) qq.push([jStat.normal.inv((i + 0.5) / n, 0, 1), sorted[i]!]);
  return { count: n, ksStatistic: d, ksPValue: pValue, qq };
}
