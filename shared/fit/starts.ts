import { streamSeed } from '../engine/random/stream-seed';
import { Xoshiro128 } from '../engine/random/xoshiro128';
import type { FitProblem } from './problem';
import type { Transform } from './transform';

/**
 * Where the optimiser starts, in search coordinates: the params cell's values first, then (when
 * several starts are asked for) points spread around them, drawn from the fit's seed so that a
 * rerun starts at the same places: within a factor of about 4.5 either way for a bounded
 * parameter (±1.5 on its log or logit scale), within half its size (at least ±0.5) otherwise.
 */
export function startPoints(problem: FitProblem, transforms: readonly Transform[]): number[][] {
  const first = problem.parameters.map((p, i) => transforms[i]!.toSearch(p.start));
  const points = [first];
  const state = new Uint32Array(4);
  streamSeed(problem.simulated.seed, 1, state);
  const random = new Xoshiro128(state);
  for (let s = 1; s < problem.starts; s++)
    points.push(
      problem.parameters.map((p, i) => {
        const bounded = p.lower !== null || p.upper !== null;
        const spread = bounded ? 1.5 : 0.5 * Math.max(Math.abs(p.start), 1);
        return first[i]! + spread * (2 * random.nextOpenUnit() - 1);
      }),
    );
  return points;
}
