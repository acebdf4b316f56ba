/** How the diff of two versions writes values: the way a modeller reads them. */

const GREEK: Record<string, string> = {
  alpha: 'α',
  beta: 'β',
  gamma: 'γ',
  delta: 'δ',
  epsilon: 'ε',
  zeta: 'ζ',
  eta: 'η',
  theta: 'θ',
  kappa: 'κ',
  lambda: 'λ',
  mu: 'μ',
  nu: 'ν',
  xi: 'ξ',
  rho: 'ρ',
  sigma: 'σ',
  tau: 'τ',
  phi: 'φ',
  chi: 'χ',
  psi: 'ψ',
  omega: 'ω',
};

/** A parameter or state name, with a Greek letter's name shown as the letter (`sigma` → σ). */
export function symbol(name: string): string {
  return GREEK[name] ?? name;
}

function decimalsOf(value: number): number | null {
  if (Number.isInteger(value)) return 0;
  const text = String(value);
  if (text.includes('e')) return null;
  return text.length - text.indexOf('.') - 1;
}

/** 12345 → "12,345"; the same on every machine (no locale). */
function grouped(value: number): string {
  const [whole, fraction] = Math.abs(value)
    .toFixed(decimalsOf(value) ?? 0)
    .split('.');
  const withCommas = whole!.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${value < 0 ? '-' : ''}${withCommas}${fraction ? `.${fraction}` : ''}`;
}

/**
 * Two numbers written alike, so they compare at a glance: the same count of decimals
 * (0.2 and 0.35 → "0.20", "0.35"), thousands grouped (10000 → "10,000").
 */
export function numberPair(before: number, after: number): [string, string] {
  const decimals = [decimalsOf(before), decimalsOf(after)];
  if (decimals.includes(null)) return [String(before), String(after)];
  const places = Math.max(...(decimals as number[]));
  const write = (value: number) =>
    places === 0 ? grouped(value) : Math.abs(value) >= 1000 ? grouped(value) : value.toFixed(places);
  return [write(before), write(after)];
}

/** Any value of a cell field, in words: numbers as numbers, expressions in backticks. */
export function valueText(value: unknown, asExpression = false): string {
  if (value === undefined || value === null) return '(none)';
  if (typeof value === 'number') return numberPair(value, value)[0];
  if (typeof value === 'string') return asExpression ? `\`${value}\`` : `"${value}"`;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return JSON.stringify(value);
}

/** "label: before → after", with numbers written alike. */
export function changeText(label: string, before: unknown, after: unknown, asExpression = false): string {
  if (typeof before === 'number' && typeof after === 'number') {
    const [from, to] = numberPair(before, after);
    return `${label}: ${from} → ${to}`;
  }
  return `${label}: ${valueText(before, asExpression)} → ${valueText(after, asExpression)}`;
}

/** Deep equality of plain data (key order does not matter). */
export function sameValue(before: unknown, after: unknown): boolean {
  if (before === after) return true;
  if (typeof before !== 'object' || typeof after !== 'object' || before === null || after === null) {
    return false;
  }
  if (Array.isArray(before) !== Array.isArray(after)) return false;
  const beforeRecord = before as Record<string, unknown>;
  const afterRecord = after as Record<string, unknown>;
  const keys = new Set([...Object.keys(beforeRecord), ...Object.keys(afterRecord)]);
  for (const key of keys) if (!sameValue(beforeRecord[key], afterRecord[key])) return false;
  return true;
}
