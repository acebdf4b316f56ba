/**
 * The math functions and constants an expression may use. This list is the whitelist of calls:
 * the checker rejects any other callee, and the generator and evaluator know only these.
 */
export interface ExpressionFunction {
  readonly name: string;
  /** Exact number of arguments, or an inclusive [min, max] range. */
  readonly arity: number | readonly [number, number];
  readonly doc: string;
}

/** Upper bound on arguments of the variadic functions; keeps calls small and readable. */
const MAX_VARIADIC_ARGS = 32;

export const EXPRESSION_FUNCTIONS = [
  { name: 'exp', arity: 1, doc: 'exp(x): e to the power x' },
  { name: 'log', arity: 1, doc: 'log(x): natural logarithm' },
  { name: 'sqrt', arity: 1, doc: 'sqrt(x): square root' },
  { name: 'abs', arity: 1, doc: 'abs(x): absolute value' },
  { name: 'sin', arity: 1, doc: 'sin(x): sine, x in radians' },
  { name: 'cos', arity: 1, doc: 'cos(x): cosine, x in radians' },
  { name: 'tan', arity: 1, doc: 'tan(x): tangent, x in radians' },
  { name: 'tanh', arity: 1, doc: 'tanh(x): hyperbolic tangent' },
  { name: 'sinh', arity: 1, doc: 'sinh(x): hyperbolic sine' },
  { name: 'cosh', arity: 1, doc: 'cosh(x): hyperbolic cosine' },
  { name: 'atan', arity: 1, doc: 'atan(x): arctangent, in radians' },
  { name: 'atan2', arity: 2, doc: 'atan2(y, x): angle of the point (x, y), in radians' },
  { name: 'asin', arity: 1, doc: 'asin(x): arcsine, in radians' },
  { name: 'acos', arity: 1, doc: 'acos(x): arccosine, in radians' },
  { name: 'min', arity: [1, MAX_VARIADIC_ARGS], doc: 'min(a, b, …): smallest argument' },
  { name: 'max', arity: [1, MAX_VARIADIC_ARGS], doc: 'max(a, b, …): largest argument' },
  { name: 'pow', arity: 2, doc: 'pow(x, y): x to the power y (same as x ** y)' },
  { name: 'sign', arity: 1, doc: 'sign(x): −1, 0 or 1' },
  { name: 'floor', arity: 1, doc: 'floor(x): largest integer ≤ x' },
  { name: 'ceil', arity: 1, doc: 'ceil(x): smallest integer ≥ x' },
  { name: 'round', arity: 1, doc: 'round(x): nearest integer, halves rounded up' },
  { name: 'log10', arity: 1, doc: 'log10(x): base-10 logarithm' },
  { name: 'log1p', arity: 1, doc: 'log1p(x): log(1 + x), accurate for small x' },
  { name: 'expm1', arity: 1, doc: 'expm1(x): exp(x) − 1, accurate for small x' },
  { name: 'hypot', arity: [1, MAX_VARIADIC_ARGS], doc: 'hypot(a, b, …): square root of the sum of squares' },
  { name: 'clamp', arity: 3, doc: 'clamp(x, lo, hi): x limited to [lo, hi]' },
  { name: 'step', arity: 1, doc: 'step(x): 1 when x ≥ 0, else 0 (Heaviside)' },
  { name: 'pos', arity: 1, doc: 'pos(x): positive part, max(x, 0)' },
] as const satisfies readonly ExpressionFunction[];

export type ExpressionFunctionName = (typeof EXPRESSION_FUNCTIONS)[number]['name'];

export interface ExpressionConstant {
  readonly name: string;
  readonly value: number;
  readonly doc: string;
}

/** Only pi: a constant named `e` would collide with too many users' own names. */
export const EXPRESSION_CONSTANTS = [
  { name: 'pi', value: Math.PI, doc: 'pi: ratio of a circle’s circumference to its diameter' },
] as const satisfies readonly ExpressionConstant[];

export type ExpressionConstantName = (typeof EXPRESSION_CONSTANTS)[number]['name'];

const functionsByName = new Map<string, ExpressionFunction>(EXPRESSION_FUNCTIONS.map((f) => [f.name, f]));
const constantsByName = new Map<string, ExpressionConstant>(EXPRESSION_CONSTANTS.map((c) => [c.name, c]));

export function findFunction(name: string): ExpressionFunction | undefined {
  return functionsByName.get(name);
}

export function findConstant(name: string): ExpressionConstant | undefined {
  return constantsByName.get(name);
}

export function arityAccepts(arity: ExpressionFunction['arity'], count: number): boolean {
  return typeof arity === 'number' ? count === arity : count >= arity[0] && count <= arity[1];
}

export function describeArity(arity: ExpressionFunction['arity']): string {
  if (typeof arity === 'number') return arity === 1 ? '1 argument' : `${arity} arguments`;
  return `${arity[0]} to ${arity[1]} arguments`;
}
