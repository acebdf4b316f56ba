import jStat from 'jstat';

export interface SlopeFit {
  slope: number;
  intercept: number;
  /** Standard error of the slope from the residuals; NaN with fewer than three points. */
  slopeSE: number;
  /** 95 % interval from Student's t with n − 2 degrees of freedom; NaN ends with < 3 points. */
  ci: [number, number];
}

/** Ordinary least squares of y on x (e.g. Draper & Smith 1998, §1.4). */
export function fitSlope(x: number[], y: number[]): SlopeFit {
  const n = x.length;
  if (n < 2) return { slope: NaN, intercept: NaN, slopeSE: NaN, ci: [NaN, NaN] };
  const meanX = x.reduce((a, b) => a + b, 0) / n;
  const meanY = y.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i]! - meanX) ** 2;
    sxy += (x[i]! - meanX) * (y[i]! - meanY);
  }
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  if (n < 3) return { slope, intercept, slopeSE: NaN, ci: [NaN, NaN] };
  let rss = 0;
  for (let i = 0; i < n; i++) rss += (y[i]! - intercept - slope * x[i]!) ** 2;
  const slopeSE = Math.sqrt(rss / (n - 2) / sxx);
  const t = jStat.studentt.inv(0.975, n - 2);
  return { slope, intercept, slopeSE, ci: [slope - t * slopeSE, slope + t * slopeSE] };
}
