/**
 * Number formatting for results. An estimate is shown to the precision its standard error
 * supports: two significant digits of the error, and the estimate to the same decimal place
 * (common practice in reporting measurements, e.g. the Particle Data Group's rounding rule
 * simplified; no single source).
 */

/** A plain number with `digits` significant digits, in exponent form when very large or small. */
export function formatSignificant(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return Number.isNaN(value) ? '—' : value > 0 ? '∞' : '−∞';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e6 || magnitude < 1e-4) return tidyExponent(value.toExponential(digits - 1));
  return stripMinus(String(Number(value.toPrecision(digits))));
}

export interface FormattedEstimate {
  estimate: string;
  standardError: string;
  low: string;
  high: string;
}

/** Estimate, error and interval with decimals matched to the error's second significant digit. */
export function formatEstimate(
  estimate: number,
  standardError: number,
  ci: readonly [number, number],
): FormattedEstimate {
  if (!(standardError > 0) || !Number.isFinite(standardError)) {
    return {
      estimate: formatSignificant(estimate, 6),
      standardError: Number.isFinite(standardError) ? formatSignificant(standardError, 2) : '—',
      // With no spread among the paths (all 0 or all 1, say) the interval is the score
      // interval's; three digits are all it can claim.
      low: formatSignificant(ci[0], 3),
      high: formatSignificant(ci[1], 3),
    };
  }
  const errorExponent = Math.floor(Math.log10(standardError));
  const decimals = 1 - errorExponent;
  const largest = Math.max(Math.abs(estimate), Math.abs(ci[0]), Math.abs(ci[1]));
  if (decimals < 0 || decimals > 8 || largest >= 1e7) {
    return {
      estimate: formatSignificant(
        estimate,
        Math.max(2, Math.floor(Math.log10(Math.abs(estimate) || 1)) - errorExponent + 2),
      ),
      standardError: formatSignificant(standardError, 2),
      low: formatSignificant(ci[0], 4),
      high: formatSignificant(ci[1], 4),
    };
  }
  return {
    estimate: fixed(estimate, decimals),
    standardError: fixed(standardError, decimals),
    low: fixed(ci[0], decimals),
    high: fixed(ci[1], decimals),
  };
}

function fixed(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return formatSignificant(value);
  return stripMinus(value.toFixed(decimals));
}

/** "-0.000" reads as a sign error; the minus sign proper (U+2212) reads better than a hyphen. */
function stripMinus(text: string): string {
  if (/^-0(\.0*)?$/.test(text)) return text.slice(1);
  return text.replace(/^-/, '−');
}

function tidyExponent(text: string): string {
  const [mantissa, exponent] = text.split('e');
  const cleanMantissa = mantissa!.includes('.') ? mantissa!.replace(/0+$/, '').replace(/\.$/, '') : mantissa!;
  return `${stripMinus(cleanMantissa)} × 10^${Number(exponent)}`;
}
