import { describe, expect, it } from 'vitest';
import { simulate, simulateChunk, chunkBytes } from '@shared/engine/simulate';
import { mergeChunks } from '@shared/engine/merge';
import { makePlan } from './plans';

const ou = makePlan({
  drift: ['0.9 * (0.25 - s0) + 0.1 * Math.sin(t)'],
  diffusion: [['0.35']],
  initial: [1],
  t1: 3,
  steps: 300,
  paths: 1000,
  saveCount: 31,
  samplePaths: 4,
  probeTimes: [1.234, 0.5],
  watches: [{ state: 0, level: 0.8, direction: 'below' }],
});

describe('reproducibility and chunking', () => {
  it('gives bit-identical results however the paths are split into chunks', () => {
    const whole = mergeChunks(ou, [simulateChunk(ou, 0, ou.paths)]);
    const split = mergeChunks(ou, [
      simulateChunk(ou, 0, 137),
      simulateChunk(ou, 137, 500),
      simulateChunk(ou, 637, 363),
    ]);
    expect(split.digest).toBe(whole.digest);
    expect(split.savedValues[0]).toEqual(whole.savedValues[0]);
    expect(split.firstPassage[0]).toEqual(whole.firstPassage[0]);
    expect(split.probes[0]!.values[0]).toEqual(whole.probes[0]!.values[0]);
  });

  it('gives the same digest on a rerun and a different one for another seed', () => {
    expect(simulate(ou).digest).toBe(simulate(ou).digest);
    expect(simulate({ ...ou, seed: ou.seed + 1 }).digest).not.toBe(simulate(ou).digest);
    expect(simulate(ou).digest).toMatch(/^[0-9a-f]{16}$/);
  });

  it('rejects chunks out of path order', () => {
    const a = simulateChunk(ou, 0, 10);
    const b = simulateChunk(ou, 10, 10);
    expect(() => mergeChunks(ou, [b, a])).toThrow(/path order/);
  });
});

describe('saved grid, probe times and sample paths', () => {
  it('snaps saved times to the nearest step when the grid does not divide the steps', () => {
    // 10 steps, 4 saved times: grid 0, 10/3, 20/3, 10 → steps 0, 3, 7, 10.
    const plan = makePlan({
      drift: ['1'],
      diffusion: [['0']],
      initial: [0],
      t1: 10,
      steps: 10,
      paths: 2,
      saveCount: 4,
    });
    const result = simulate(plan);
    expect(Array.from(result.savedSteps)).toEqual([0, 3, 7, 10]);
    expect(Array.from(result.savedTimes)).toEqual([0, 3, 7, 10]);
    // dX = dt: the saved values are the saved times.
    expect(Array.from(result.samplePaths[0]![0]!)).toEqual([0, 3, 7, 10]);
  });

  it('saves a step twice when there are more saved times than steps', () => {
    const plan = makePlan({
      drift: ['1'],
      diffusion: [['0']],
      initial: [0],
      t1: 2,
      steps: 2,
      paths: 1,
      saveCount: 5,
    });
    const result = simulate(plan);
    // Grid 0, 0.5, 1, 1.5, 2 → nearest steps 0, 1, 1, 2, 2 (Math.round rounds halves up).
    expect(Array.from(result.savedSteps)).toEqual([0, 1, 1, 2, 2]);
    expect(Array.from(result.samplePaths[0]![0]!)).toEqual([0, 1, 1, 2, 2]);
  });

  it('refuses a run whose saved values would not fit in memory, before any work', () => {
    const plan = makePlan({
      drift: ['0'],
      diffusion: [['1']],
      initial: [0],
      t1: 1,
      steps: 10,
      paths: 10_000_000,
      saveCount: 101,
    });
    expect(() => simulateChunk(plan, 0, 10)).toThrow(/lower the number of paths or saved times/);
  });

  it('keeps values at probe times snapped to the step grid, in the order asked', () => {
    const result = simulate(ou);
    expect(result.probes.map((probe) => probe.time)).toEqual([1.23, 0.5]);
    // t = 0.5 is also a saved time (index 5): the same numbers.
    expect(result.probes[1]!.values[0]).toEqual(result.savedValues[0]!.subarray(5 * ou.paths, 6 * ou.paths));
  });

  it('returns the first paths as sample paths, equal to their saved values', () => {
    const result = simulate(ou);
    expect(result.samplePaths[0]).toHaveLength(4);
    expect(result.samplePaths[0]![2]![7]).toBe(result.savedValues[0]![7 * ou.paths + 2]);
    expect(result.finalValues[0]![3]).toBe(result.samplePaths[0]![3]![30]);
  });

  it('records first passages consistent with the running minimum', () => {
    const result = simulate(ou);
    let mismatches = 0;
    let reachedCount = 0;
    for (let p = 0; p < ou.paths; p++) {
      const reached = result.runningMin[0]![p]! <= 0.8;
      if (reached) reachedCount++;
      if (Number.isNaN(result.firstPassage[0]![p]!) === reached) mismatches++;
    }
    expect(mismatches).toBe(0);
    expect(reachedCount).toBeGreaterThan(0);
  });
});

describe('memory', () => {
  it('grows with paths × saved times, never with steps', () => {
    const big = makePlan({
      drift: ['0'],
      diffusion: [['1']],
      initial: [0],
      t1: 1,
      steps: 10_000,
      paths: 100_000,
      saveCount: 200,
    });
    // 8 bytes · 100 000 paths · (200 saved + 3 per-state records + 1 loss time) + 1 byte per path
    // (loss cause) = 163.3 MB.
    expect(chunkBytes(big, 100_000)).toBe(8 * 100_000 * 204 + 100_000);
    expect(chunkBytes({ ...big, steps: 1_000_000 }, 100_000)).toBe(chunkBytes(big, 100_000));
    // A scaled-down run (1000 paths × 10 000 steps × 200 saved times) allocates just that.
    const chunk = simulateChunk({ ...big, paths: 1000 }, 0, 1000);
    expect(chunk.saved.length).toBe(1000 * 200);
    expect(
      chunk.saved.byteLength +
        chunk.runningMax.byteLength * 3 +
        chunk.blowupTime.byteLength +
        chunk.lossCause.byteLength,
    ).toBe(chunkBytes(big, 1000));
  });
});

describe('correlated noise', () => {
  it('gives increments with the requested correlation within 5 standard errors', () => {
    const rho = -0.35;
    const plan = makePlan({
      drift: ['0', '0'],
      diffusion: [
        ['1', '0'],
        ['0', '1'],
      ],
      correlation: [
        [1, rho],
        [rho, 1],
      ],
      initial: [0, 0],
      t1: 0.5,
      steps: 1,
      paths: 40_000,
      saveCount: 2,
    });
    const result = simulate(plan);
    const x = result.finalValues[0]!;
    const y = result.finalValues[1]!;
    const n = x.length;
    let sx = 0,
      sy = 0,
      sxx = 0,
      syy = 0,
      sxy = 0;
    for (let p = 0; p < n; p++) {
      sx += x[p]!;
      sy += y[p]!;
      sxx += x[p]! ** 2;
      syy += y[p]! ** 2;
      sxy += x[p]! * y[p]!;
    }
    const r = (sxy - (sx * sy) / n) / Math.sqrt((sxx - (sx * sx) / n) * (syy - (sy * sy) / n));
    // SE of a sample correlation of normal data ≈ (1 − ρ²)/√n (Fisher 1915, large-sample form).
    expect(Math.abs(r - rho)).toBeLessThan((5 * (1 - rho * rho)) / Math.sqrt(n));
    // Variance h per increment: SE σ²√(2/(n−1)).
    expect(Math.abs(result.stats[1]!.variance[1]! - 0.5)).toBeLessThan(5 * 0.5 * Math.sqrt(2 / (n - 1)));
  });

  it('rejects a correlation matrix that is not positive definite', () => {
    const plan = makePlan({
      drift: ['0', '0', '0'],
      diffusion: [
        ['1', '0', '0'],
        ['0', '1', '0'],
        ['0', '0', '1'],
      ],
      correlation: [
        [1, 0.9, 0.9],
        [0.9, 1, -0.9],
        [0.9, -0.9, 1],
      ],
      initial: [0, 0, 0],
      t1: 1,
      steps: 10,
      paths: 10,
    });
    expect(() => simulate(plan)).toThrow(RangeError);
    expect(() => simulate(plan)).toThrow(/not positive definite/);
  });
});

describe('boundaries', () => {
  // Arithmetic Brownian motion dX = m dt + s dW from x0 towards 0 (our values).
  const drift = -0.2;
  const vol = 0.5;
  const x0 = 0.5;
  const steps = 2000;
  const absorbing = makePlan({
    drift: [`${drift}`],
    diffusion: [[`${vol}`]],
    initial: [x0],
    t1: 1,
    steps,
    paths: 10_000,
    boundaries: [{ rule: 'absorb', level: 0, side: 'below' }],
  });

  it('absorbs at the level: extinction records, frozen values, probability near the closed form', () => {
    const result = simulate(absorbing);
    const extinction = result.extinctions[0]!;
    expect(extinction.state).toBe(0);
    expect(extinction.count).toBeGreaterThan(0);
    let absorbed = 0;
    let notFrozen = 0;
    for (let p = 0; p < result.paths; p++) {
      const time = result.absorptionTime[0]![p]!;
      if (Number.isNaN(time)) continue;
      absorbed++;
      if (result.finalValues[0]![p] !== 0 || !(time > 0)) notFrozen++;
    }
    expect(absorbed).toBe(extinction.count);
    expect(notFrozen).toBe(0);
    expect(result.stats[0]!.min[10]).toBeGreaterThanOrEqual(0);
    // P(min_{s≤T} X_s ≤ 0) = Φ((−x0 − mT)/(s√T)) + e^{−2m x0/s²} Φ((−x0 + mT)/(s√T)) (first passage of
    // Brownian motion with drift, e.g. Borodin & Salminen 2002, 1.1.4). Discrete monitoring sees
    // fewer crossings; Broadie, Glasserman & Kou (1997) shift the level by 0.5826·s·√h, used here
    // as the expected value, with the shift's effect added to the tolerance.
    const phi = (x: number) => 0.5 * (1 + erf(x / Math.SQRT2));
    const crossing = (start: number) =>
      phi((-start - drift) / vol) +
      Math.exp((-2 * drift * start) / (vol * vol)) * phi((-start + drift) / vol);
    const corrected = crossing(x0 + 0.5826 * vol * Math.sqrt(1 / steps));
    const p = extinction.count / result.paths;
    const standardError = Math.sqrt((corrected * (1 - corrected)) / result.paths);
    expect(Math.abs(p - corrected)).toBeLessThan(5 * standardError + Math.abs(corrected - crossing(x0)));
  });

  it('reflects at the level: paths stay on one side', () => {
    const plan = {
      ...absorbing,
      boundaries: [{ rule: 'reflect' as const, level: 0, side: 'below' as const }],
    };
    const result = simulate(plan);
    expect(result.extinctions).toEqual([]);
    expect(Math.min(...result.runningMin[0]!)).toBeGreaterThanOrEqual(0);
    // Many paths did meet the level (without reflection about 40 % would cross).
    let nearLevel = 0;
    for (let p = 0; p < result.paths; p++) if (result.runningMin[0]![p]! < 0.02) nearLevel++;
    expect(nearLevel).toBeGreaterThan(result.paths * 0.2);
  });

  it('reflects from above too', () => {
    const plan = makePlan({
      drift: ['1'],
      diffusion: [['0.3']],
      initial: [0],
      t1: 2,
      steps: 200,
      paths: 500,
      boundaries: [{ rule: 'reflect', level: 0.5, side: 'above' }],
    });
    const result = simulate(plan);
    expect(Math.max(...result.runningMax[0]!)).toBeLessThanOrEqual(0.5);
  });
});

/** Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7), enough for a Monte Carlo tolerance. */
function erf(x: number): number {
  const sign = Math.sign(x);
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y =
    1 -
    ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) *
      t *
      Math.exp(-a * a);
  return sign * y;
}

describe('blow-ups', () => {
  // dX = X² dt from X0 = 1 explodes at t = 1 (X = 1/(1 − t)).
  const plan = makePlan({
    drift: ['s0 * s0'],
    diffusion: [['0.01']],
    initial: [1],
    t1: 2,
    steps: 200,
    paths: 50,
    blowupBound: 1e6,
  });

  it('counts paths that leave the bound, with their time, and suggests a smaller step', () => {
    const result = simulate(plan);
    expect(result.blowups.count).toBe(50);
    expect(result.blowups.firstTime).toBeGreaterThan(1);
    expect(result.blowups.firstTime).toBeLessThan(2);
    expect(result.blowups.suggestion).toMatch(/try a smaller step/i);
    const last = plan.saveCount - 1;
    expect(result.stats[0]!.live[last]).toBe(0);
    expect(Number.isNaN(result.stats[0]!.mean[last]!)).toBe(true);
    expect(result.stats[0]!.live[0]).toBe(50);
  });

  it('flags a path that starts beyond the bound and stays there at the first step', () => {
    // No drift, no noise: X stays at 3 > 2 = bound, so the path is beyond the bound after step 1
    // (t = h) — the blow-up definition of this engine (common practice, no source).
    const still = makePlan({
      drift: ['0'],
      diffusion: [['0']],
      initial: [3],
      t1: 1,
      steps: 10,
      paths: 5,
      blowupBound: 2,
    });
    const result = simulate(still);
    expect(result.blowups.count).toBe(5);
    expect(result.blowups.firstTime).toBeCloseTo(0.1, 12);
  });

  it('times a deterministic blow-up to the step', () => {
    // Euler for dX = X dt gives X_n = (1 + h)^n X_0 (Kloeden & Platen 1992, §9.1 with b = 0);
    // with h = 0.1 it first exceeds 2 at n = 8 (1.1^7 ≈ 1.949, 1.1^8 ≈ 2.144), so t = 0.8.
    const growth = makePlan({
      drift: ['s0'],
      diffusion: [['0']],
      initial: [1],
      t1: 1,
      steps: 10,
      paths: 3,
      blowupBound: 2,
    });
    const result = simulate(growth);
    expect(result.blowups.count).toBe(3);
    expect(result.blowups.firstTime).toBeCloseTo(0.8, 12);
  });

  it('catches infinite values when there is no bound', () => {
    const result = simulate({ ...plan, blowupBound: null });
    expect(result.blowups.count).toBe(50);
    expect(Number.isNaN(result.finalValues[0]![0]!)).toBe(true);
  });
});

describe('mean-square stability (Higham 2000, SIAM J. Numer. Anal. 38(3))', () => {
  // dX = λX dt + μX dW, λ = −3, μ = √3: the model is mean-square stable (2λ + μ² = −3 < 0).
  // Euler–Maruyama: E[X_{n+1}²] = ((1 + hλ)² + hμ²) E[X_n²]: 13/16 at h = 1/4, 7/4 at h = 1/2.
  const lambda = -3;
  const mu = Math.sqrt(3);
  const paths = 50_000;
  const build = (steps: number) =>
    makePlan({
      drift: [`${lambda} * s0`],
      diffusion: [[`${mu} * s0`]],
      initial: [1],
      t1: 2,
      steps,
      paths,
      saveCount: 2,
    });

  function secondMoment(values: Float64Array): number {
    let sum = 0;
    for (const x of values) sum += x * x;
    return sum / values.length;
  }

  /** E[R⁴] of R = 1 + hλ + μ√h z: a⁴ + 6a²c² + 3c⁴ with a = 1 + hλ, c² = hμ². */
  function fourthFactor(h: number): number {
    const a = 1 + h * lambda;
    const c2 = h * mu * mu;
    return a ** 4 + 6 * a * a * c2 + 3 * c2 * c2;
  }

  it('reports h = 1/4 as stable and the second moment decays', () => {
    const result = simulate(build(8));
    expect(result.stability).toMatchObject({ scheme: 'euler-maruyama', stable: true, h: 0.25 });
    expect(result.stability!.lambda).toBeCloseTo(lambda, 12);
    expect(result.stability!.mu).toBeCloseTo(mu, 12);
    expect(result.stability!.amplification).toBeCloseTo(13 / 16, 12);
    const expected = (13 / 16) ** 8;
    // SE of the sample mean of X²: √((E[X⁴] − E[X²]²)/n), with E[X⁴] = E[R⁴]^N exactly for the scheme.
    const standardError = Math.sqrt((fourthFactor(0.25) ** 8 - expected ** 2) / paths);
    const observed = secondMoment(result.finalValues[0]!);
    expect(Math.abs(observed - expected)).toBeLessThan(5 * standardError);
    expect(observed).toBeLessThan(1 - 5 * standardError);
  });

  it('reports h = 1/2 as unstable and the second moment grows', () => {
    const result = simulate(build(4));
    expect(result.stability).toMatchObject({ stable: false, h: 0.5 });
    expect(result.stability!.amplification).toBeCloseTo(7 / 4, 12);
    expect(result.stability!.message).toMatch(/NOT mean-square stable/);
    const expected = (7 / 4) ** 4;
    const standardError = Math.sqrt((fourthFactor(0.5) ** 4 - expected ** 2) / paths);
    const observed = secondMoment(result.finalValues[0]!);
    expect(Math.abs(observed - expected)).toBeLessThan(5 * standardError);
    expect(observed).toBeGreaterThan(1 + 5 * standardError);
  });

  it('reports the Milstein and Heun amplification factors that the simulation shows', () => {
    // Our derived E[R²] for the derivative-free Milstein and the stochastic Heun steps (see
    // stability.ts, same computation as Higham 2000): E[X_N²] = E[R²]^N for the scheme, checked
    // against the sample second moment within 5 sample standard errors.
    for (const [method, calculus] of [
      ['milstein', 'ito'],
      ['heun', 'stratonovich'],
    ] as const) {
      const plan = { ...build(8), method, model: { ...build(8).model, calculus } };
      const result = simulate(plan);
      const factor = result.stability!.amplification;
      const squares = Array.from(result.finalValues[0]!, (x) => x * x);
      const mean = squares.reduce((a, b) => a + b, 0) / paths;
      const sd = Math.sqrt(squares.reduce((a, b) => a + (b - mean) ** 2, 0) / (paths - 1));
      expect(Math.abs(mean - factor ** 8)).toBeLessThan((5 * sd) / Math.sqrt(paths));
      expect(result.stability!.scheme).toBe(method);
    }
  });

  it('falls back to the linearised drift for a model that is not scalar and linear', () => {
    expect(simulate({ ...build(8), paths: 10 }).stability?.check).toBe('mean-square');
    expect(
      simulate(
        makePlan({
          drift: ['-s0 * s0 * s0'],
          diffusion: [['0.2']],
          initial: [1],
          t1: 1,
          steps: 10,
          paths: 10,
        }),
      ).stability?.check,
    ).toBe('linear-drift');
  });
});

describe('progress and cancel', () => {
  const plan = makePlan({
    drift: ['-s0'],
    diffusion: [['1']],
    initial: [0],
    t1: 1,
    steps: 1000,
    paths: 3000,
  });

  it('reports progress up to the chunk size', () => {
    const reports: number[] = [];
    const chunk = simulateChunk(plan, 0, plan.paths, { onProgress: (done) => reports.push(done) });
    expect(reports.at(-1)).toBe(plan.paths);
    expect(reports.length).toBeGreaterThan(1);
    for (let i = 1; i < reports.length; i++) expect(reports[i]).toBeGreaterThan(reports[i - 1]!);
    expect(chunk.cancelled).toBe(false);
  });

  it('stops between batches when asked and says how many paths are done', () => {
    let polls = 0;
    const chunk = simulateChunk(plan, 0, plan.paths, { shouldStop: () => ++polls > 2 });
    expect(chunk.cancelled).toBe(true);
    expect(chunk.pathsDone).toBeGreaterThan(0);
    expect(chunk.pathsDone).toBeLessThan(plan.paths);
    // The first batch is about 100 000 path-steps: 100 paths of 1000 steps.
    expect(chunk.pathsDone).toBeLessThanOrEqual(100 * 4 + 100);
    const merged = mergeChunks(plan, [chunk]);
    expect(merged.cancelled).toBe(true);
    expect(merged.paths).toBe(chunk.pathsDone);
  });
});

describe('cancel inside long paths', () => {
  it('polls shouldStop within a path of many steps and drops the unfinished path', () => {
    const plan = makePlan({
      drift: ['-s0'],
      diffusion: [['1']],
      initial: [0],
      t1: 1,
      steps: 300_000,
      paths: 3,
      saveCount: 3,
    });
    let polls = 0;
    const chunk = simulateChunk(plan, 0, plan.paths, { shouldStop: () => ++polls > 2 });
    // One poll before the first batch, then every 65 536 steps inside the path: the third poll
    // (step 131 072 of path 0) stops it, so no path is complete.
    expect(polls).toBe(3);
    expect(chunk.cancelled).toBe(true);
    expect(chunk.pathsDone).toBe(0);
  });
});

describe('plan checks', () => {
  it('rejects Milstein for non-diagonal noise and names the alternative', () => {
    const plan = makePlan({
      drift: ['0', '0'],
      diffusion: [
        ['1', 's1'],
        ['0', '1'],
      ],
      initial: [0, 0],
      t1: 1,
      steps: 10,
      paths: 10,
      method: 'milstein',
    });
    expect(() => simulate(plan)).toThrow(/Milstein needs scalar noise.*Euler–Maruyama/);
  });

  it('rejects stochastic Heun for an Itô model with state-dependent noise', () => {
    const plan = makePlan({
      drift: ['0'],
      diffusion: [['s0']],
      initial: [1],
      t1: 1,
      steps: 10,
      paths: 10,
      method: 'heun',
    });
    expect(() => simulate(plan)).toThrow(/Stratonovich/);
  });

  it('rejects probe times outside the run and bad sizes with clear messages', () => {
    const plan = makePlan({ drift: ['0'], diffusion: [['1']], initial: [0], t1: 1, steps: 10, paths: 10 });
    expect(() => simulate({ ...plan, probeTimes: [2] })).toThrow(/probe time must lie between 0 and 1/);
    expect(() => simulate({ ...plan, steps: 0 })).toThrow(/steps must be a positive integer/);
    expect(() => simulate({ ...plan, t1: -1 })).toThrow(/end time must be after the start time/);
  });
});
