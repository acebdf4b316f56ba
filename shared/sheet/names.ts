import { EXPRESSION_CONSTANTS, EXPRESSION_FUNCTIONS } from '../expr';

/** The time variable, in scope in drift, diffusion and exact expressions. */
export const TIME_NAME = 't';

/**
 * Words JavaScript reserves (or gives a global meaning), so the parser would not read them as
 * plain names. `__proto__` is refused too: names become keys of plain objects.
 */
const JS_RESERVED = new Set([
  'break',
  'case',
  'catch',
  'class',
  'const',
  'continue',
  'debugger',
  'default',
  'delete',
  'do',
  'else',
  'enum',
  'export',
  'extends',
  'false',
  'finally',
  'for',
  'function',
  'if',
  'import',
  'in',
  'instanceof',
  'new',
  'null',
  'return',
  'super',
  'switch',
  'this',
  'throw',
  'true',
  'try',
  'typeof',
  'var',
  'void',
  'while',
  'with',
  'yield',
  'let',
  'static',
  'implements',
  'interface',
  'package',
  'private',
  'protected',
  'public',
  'await',
  'async',
  'arguments',
  'eval',
  'undefined',
  'NaN',
  'Infinity',
  '__proto__',
]);

/**
 * Names every plain object inherits (`constructor`, `toString`, `valueOf`, …): a record keyed by
 * user names would find an inherited function under them, so they are refused outright.
 */
const OBJECT_PROPERTY_NAMES = new Set(Object.getOwnPropertyNames(Object.prototype));

const FUNCTION_NAMES = new Set<string>(EXPRESSION_FUNCTIONS.map((f) => f.name));
const CONSTANT_NAMES = new Set<string>(EXPRESSION_CONSTANTS.map((c) => c.name));

/** Why a user's name cannot be used, or null when it can. (Names like s0 or w1 are fine: generation renames.) */
export function reservedNameProblem(name: string): string | null {
  if (name === TIME_NAME) return `'${name}' is reserved for the time; choose another name`;
  if (CONSTANT_NAMES.has(name)) return `'${name}' is a built-in constant; choose another name`;
  if (FUNCTION_NAMES.has(name)) return `'${name}' is the name of a built-in function; choose another name`;
  if (JS_RESERVED.has(name)) return `'${name}' is a reserved word; choose another name`;
  if (OBJECT_PROPERTY_NAMES.has(name))
    return `'${name}' is a property every JavaScript object has; choose another name`;
  return null;
}
