import { nelderMead } from 'fmin/src/nelderMead.js';

/**
 * Minimises `objective` over unbounded coordinates with fmin's Nelder–Mead, restarted from the
 * best point until a fresh simplex finds nothing better. Restarting is the usual remedy for a
 * simplex that has stagnated (Kelley 1999, SIAM J. Optimization 10, 43–55); here it also
 * replaces fmin's shrink step (`sigma: 1` makes fmin stop where it would shrink). The search runs
 * in scaled coordinates u, z = centre + step · u, so the first simplex has the size of `step`
 * whatever the parameters' magnitudes.
 */

export interface MinimiseOptions {
  /** Size of the first simplex along each coordinate. */
  step: readonly number[];
  /** Restarts after the first search, at most. */
  maxRestarts?: number;
  /** Tolerance on the objective between a search and its restart. */
  tolerance?: number;
}

export interface MinimiseOutcome {
  z: number[];
  value: number;
  converged: boolean;
  searches: number;
}

const TOLERANCE = 1e-7;

export function minimise(
  objective: (z: number[]) => number,
  start: readonly number[],
  options: MinimiseOptions,
): MinimiseOutcome {
  const n = start.length;
  const tolerance = options.tolerance ?? TOLERANCE;
  const finite = (z: number[]) => {
    const value = objective(z);
    return Number.isFinite(value) ? value : Number.MAX_VALUE;
  };
  let centre = [...start];
  let value = finite(centre);
  let searches = 0;
  for (let restart = 0; restart <= (options.maxRestarts ?? 12); restart++) {
    const base = centre;
    const inScaled = (u: number[]) => finite(base.map((z, i) => z + options.step[i]! * u[i]!));
    const found = nelderMead(inScaled, new Array<number>(n).fill(0), {
      zeroDelta: 1,
      sigma: 1,
      minErrorDelta: 1e-10,
      maxIterations: 300 * n,
    });
    searches++;
    const moved = Math.max(...found.x.map(Math.abs));
    const improvement = value - found.fx;
    if (found.fx < value) {
      centre = base.map((z, i) => z + options.step[i]! * found.x[i]!);
      value = found.fx;
    }
    if (improvement < tolerance && moved < 1e-3) return { z: centre, value, converged: true, searches };
  }
  return { z: centre, value, converged: false, searches };
}
