import { EXPRESSION_PRELUDE } from '../expr';
import type { SimulationPlan, WatchSpec } from './plan';
import { compileGenerated } from './compile-generated';
import { statesMentioned } from './methods/source-tools';

/**
 * The Broadie–Glasserman–Kou continuity correction for a level watched at the steps only
 * (Broadie, Glasserman & Kou 1997, "A continuity correction for discrete barrier options", Math.
 * Finance 7(4)): a path monitored every h crosses a level later than a continuous one, and the
 * continuous crossing law is matched to o(√h) by watching a level moved toward the start by
 * β σ √h, β = −ζ(1/2)/√(2π) ≈ 0.5826, σ the diffusion at the level. σ is known at the level when
 * the state's diffusion depends on that state alone (not on t or other states).
 */
export const BGK_BETA = 0.5825971579390106;

const USES_TIME = /(?<![\w$.])t(?![\w$])/;

/** Standard deviation per √time of the state's increment at the level: √(Σ_jk b_j b_k ρ_jk). */
function sigmaAtLevel(plan: SimulationPlan, watch: WatchSpec): number {
  const { model } = plan;
  const row = model.diffusion[watch.state]!;
  const name = model.stateNames[watch.state]!;
  for (const source of row) {
    const others = statesMentioned(source).filter((i) => i !== watch.state);
    if (others.length > 0 || USES_TIME.test(source)) {
      throw new RangeError(
        `the continuity correction needs σ at the level known, but the diffusion of ${name} depends on ${others.length > 0 ? others.map((i) => model.stateNames[i]).join(', ') : 't'}; use discrete monitoring`,
      );
    }
  }
  const values = row.map((source) =>
    // Built from the plan's checked sources (see plan.ts); evaluated once per watch.
    compileGenerated<(x: number) => number>(
      ['x'],
      `"use strict"; ${EXPRESSION_PRELUDE} const s${watch.state} = x; return (${source});`,
    )(watch.level),
  );
  let variance = 0;
  values.forEach((bj, j) =>
    values.forEach((bk, k) => {
      const rho = model.correlation === null ? (j === k ? 1 : 0) : model.correlation[j]![k]!;
      variance += bj * bk * rho;
    }),
  );
  const sigma = Math.sqrt(variance);
  if (!Number.isFinite(sigma))
    throw new RangeError(`the diffusion of ${name} is not finite at the watched level ${watch.level}`);
  return sigma;
}

/** The level the kernel compares against: the watch's own, or moved toward the start by β σ √h. */
export function monitoredLevel(plan: SimulationPlan, watch: WatchSpec, h: number): number {
  if (watch.correction !== 'bgk') return watch.level;
  const shift = BGK_BETA * sigmaAtLevel(plan, watch) * Math.sqrt(h);
  return watch.direction === 'above' ? watch.level - shift : watch.level + shift;
}
