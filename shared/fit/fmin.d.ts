/** The one fmin function the fit uses (fmin ships no types). */
declare module 'fmin/src/nelderMead.js' {
  export interface NelderMeadOptions {
    maxIterations?: number;
    nonZeroDelta?: number;
    zeroDelta?: number;
    minErrorDelta?: number;
    rho?: number;
    chi?: number;
    psi?: number;
    sigma?: number;
  }
  export function nelderMead(
    f: (x: number[]) => number,
    x0: number[],
    parameters?: NelderMeadOptions,
  ): { fx: number; x: number[] };
}
