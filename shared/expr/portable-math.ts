import acos from '@stdlib/math-base-special-acos';
import asin from '@stdlib/math-base-special-asin';
import atan from '@stdlib/math-base-special-atan';
import atan2 from '@stdlib/math-base-special-atan2';
import cos from '@stdlib/math-base-special-cos';
import cosh from '@stdlib/math-base-special-cosh';
import exp from '@stdlib/math-base-special-exp';
import expm1 from '@stdlib/math-base-special-expm1';
import hypot from '@stdlib/math-base-special-hypot';
import ln from '@stdlib/math-base-special-ln';
import log10 from '@stdlib/math-base-special-log10';
import log1p from '@stdlib/math-base-special-log1p';
import pow from '@stdlib/math-base-special-pow';
import sin from '@stdlib/math-base-special-sin';
import sinh from '@stdlib/math-base-special-sinh';
import tan from '@stdlib/math-base-special-tan';
import tanh from '@stdlib/math-base-special-tanh';

/**
 * Elementary functions that give the same bits in every JavaScript engine. The engines' own
 * `Math.exp`, `Math.log`, `Math.pow`, `Math.sin` … are only required to be close, and they differ:
 * Node 20 and a current Chromium disagree in the last bit on most inputs (measured on 30,000
 * inputs per function; only sqrt and hypot agreed), so a sheet run in a browser and by the
 * command-line runner would give different digests. These are stdlib's ports of the FreeBSD
 * msun (fdlibm) algorithms in plain JavaScript: only IEEE-754 arithmetic and bit operations.
 * `sqrt`, `abs`, `min`, `max`, `floor`, `ceil`, `round` and `sign` are exact in IEEE-754 and stay
 * the engine's own.
 */
export const PORTABLE_MATH = {
  exp,
  log: ln,
  pow,
  sin,
  cos,
  tan,
  atan,
  atan2,
  asin,
  acos,
  sinh,
  cosh,
  tanh,
  log10,
  log1p,
  expm1,
  hypot,
} as const;

/** The name generated code reads PORTABLE_MATH by (compile-generated.ts passes it in). */
export const PORTABLE_MATH_NAME = 'f_lib';
