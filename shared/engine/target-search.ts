/**
 * Stochastic root finding on a swept curve: the parameter value x at which a probe's expected
 * value equals a target. The sweep brackets the root (two neighbouring values whose estimates lie
 * on either side of the target); then secant steps kept inside the bracket (regula falsi, Illinois
 * variant, Dowell & Jarratt 1971, BIT 11; with a bisection-like safeguard, e.g. Press et al. 2007,
 * Numerical Recipes §9.2) on refined runs with the same random streams. The interval is every x
 * whose 95 % interval, interpolated linearly between the evaluated values, contains the target:
 * the inversion of the pointwise confidence band.
 */

export interface CurvePoint {
  x: number;
  estimate: number;
  ci: [number, number];
}

export interface TargetSearchResult {
  target: number;
  bracketed: boolean;
  /** The estimated root (null when the target is not bracketed). */
  root: number | null;
  /** Values whose interval contains the target; an end at the swept range's edge is open. */
  interval: [number, number] | null;
  /** The interval reaches the first or last swept value: the root may lie beyond it. */
  openBelow: boolean;
  openAbove: boolean;
  /** Refined runs made by the search, in the order made. */
  refined: CurvePoint[];
  /** Plain words for the person: the answer or why there is none. */
  message: string;
}

export interface TargetSearchOptions {
  /** Refined runs at most (0: interpolate the sweep only). */
  iterations: number;
  /** Runs the probe at x (a refined run with common random numbers). */
  evaluate(x: number): Promise<CurvePoint>;
  /** Stop early when asked (a cancel). */
  isCancelled?(): boolean;
}

const side = (point: CurvePoint, target: number): number => Math.sign(point.estimate - target);

/** The first neighbouring pair whose estimates straddle the target, or null. */
function findBracket(points: readonly CurvePoint[], target: number): [CurvePoint, CurvePoint] | null {
  for (let k = 0; k + 1 < points.length; k++) {
    const a = points[k]!;
    const b = points[k + 1]!;
    if (side(a, target) === 0) return [a, a];
    if (side(a, target) * side(b, target) < 0) return [a, b];
  }
  const last = points[points.length - 1];
  return last && side(last, target) === 0 ? [last, last] : null;
}

/**
 * The secant (linear interpolation) zero of f between (a, fa) and (b, fb), f = estimate − target,
 * pulled at least 10 % inside the bracket.
 */
function secantPoint(a: number, fa: number, b: number, fb: number): number {
  const width = b - a;
  const raw = fb === fa ? a + width / 2 : a - (fa * width) / (fb - fa);
  const lo = a + 0.1 * width;
  const hi = b - 0.1 * width;
  return Number.isFinite(raw) ? Math.min(hi, Math.max(lo, raw)) : a + width / 2;
}

/** Linear interpolation of where the curve f crosses the target between two points. */
function crossing(a: { x: number; f: number }, b: { x: number; f: number }, target: number): number {
  if (b.f === a.f) return (a.x + b.x) / 2;
  return a.x + ((target - a.f) * (b.x - a.x)) / (b.f - a.f);
}

/**
 * The connected run of x around the root where lower ≤ target ≤ upper, with the band between
 * evaluated points interpolated linearly.
 */
export function bandInterval(
  points: readonly CurvePoint[],
  target: number,
  root: number,
): { interval: [number, number]; openBelow: boolean; openAbove: boolean } {
  const sorted = [...points].sort((p, q) => p.x - q.x);
  const contains = (p: CurvePoint) => p.ci[0] <= target && target <= p.ci[1];
  // Start from the evaluated points nearest the root on each side.
  let right = sorted.findIndex((p) => p.x >= root);
  if (right < 0) right = sorted.length - 1;
  const left = sorted[right]!.x > root && right > 0 ? right - 1 : right;

  let lowEnd: number;
  let openBelow = false;
  let k = left;
  for (;;) {
    const point = sorted[k]!;
    if (!contains(point)) {
      const inner = k + 1 < sorted.length ? sorted[k + 1]! : point;
      lowEnd = edge(point, inner, target);
      break;
    }
    if (k === 0) {
      lowEnd = point.x;
      openBelow = true;
      break;
    }
    k--;
  }
  let highEnd: number;
  let openAbove = false;
  k = right;
  for (;;) {
    const point = sorted[k]!;
    if (!contains(point)) {
      const inner = k > 0 ? sorted[k - 1]! : point;
      highEnd = edge(point, inner, target);
      break;
    }
    if (k === sorted.length - 1) {
      highEnd = point.x;
      openAbove = true;
      break;
    }
    k++;
  }
  return {
    interval: [Math.min(lowEnd, root), Math.max(highEnd, root)],
    openBelow,
    openAbove,
  };
}

/** Where the band's violated bound crosses the target between an outside point and an inside one. */
function edge(outside: CurvePoint, inside: CurvePoint, target: number): number {
  if (outside === inside) return outside.x;
  const bound = outside.ci[0] > target ? 0 : 1;
  return crossing({ x: outside.x, f: outside.ci[bound] }, { x: inside.x, f: inside.ci[bound] }, target);
}

function describe(result: Omit<TargetSearchResult, 'message'>, points: readonly CurvePoint[]): string {
  if (!result.bracketed) {
    const above = points.every((p) => p.estimate > result.target);
    const first = points[0]?.x;
    const last = points[points.length - 1]?.x;
    return `the target ${result.target} is not bracketed: every swept value from ${first} to ${last} gives an estimate ${above ? 'above' : 'below'} it (widen the range)`;
  }
  const [lo, hi] = result.interval!;
  const open = [
    result.openBelow ? 'the interval reaches the lowest swept value' : '',
    result.openAbove ? 'the interval reaches the highest swept value' : '',
  ].filter((text) => text !== '');
  return `target ${result.target} met at ${result.root!.toPrecision(4)}, interval ${lo.toPrecision(4)} to ${hi.toPrecision(4)}${open.length > 0 ? ` (${open.join('; ')}: the root may lie beyond it)` : ''}`;
}

/** Finds where the curve meets `target`, starting from the sweep's points (sorted by x). */
export async function searchTarget(
  sweep: readonly CurvePoint[],
  target: number,
  options: TargetSearchOptions,
): Promise<TargetSearchResult> {
  const points = [...sweep].sort((p, q) => p.x - q.x);
  const bracket = findBracket(points, target);
  const refined: CurvePoint[] = [];
  if (bracket === null) {
    const base = {
      target,
      bracketed: false,
      root: null,
      interval: null,
      openBelow: false,
      openAbove: false,
      refined,
    };
    return { ...base, message: describe(base, points) };
  }
  let [a, b] = bracket;
  // Illinois variant of regula falsi: an end kept twice in a row has its f halved, so the
  // secant also moves the far end and the bracket shrinks from both sides.
  let fa = a.estimate - target;
  let fb = b.estimate - target;
  let kept: 'a' | 'b' | null = null;
  for (let i = 0; i < options.iterations && a !== b; i++) {
    if (options.isCancelled?.() === true) break;
    const point = await options.evaluate(secantPoint(a.x, fa, b.x, fb));
    refined.push(point);
    const f = point.estimate - target;
    if (side(point, target) === 0) {
      a = point;
      b = point;
    } else if (side(point, target) === side(a, target)) {
      a = point;
      fa = f;
      if (kept === 'b') fb /= 2;
      kept = 'b';
    } else {
      b = point;
      fb = f;
      if (kept === 'a') fa /= 2;
      kept = 'a';
    }
  }
  const root = a === b ? a.x : crossing({ x: a.x, f: a.estimate }, { x: b.x, f: b.estimate }, target);
  const band = bandInterval([...points, ...refined], target, root);
  const base = { target, bracketed: true, root, ...band, refined };
  return { ...base, message: describe(base, points) };
}
