// Over 300 lines on purpose: the kernel's source is built in one place so the order of its
// operations (which fixes the digest) can be read from top to bottom.
import { EXPRESSION_PRELUDE } from '../expr';
import type { SimulationPlan } from './plan';
import type { PlanLayout } from './layout';
import { LOSS_CAUSE_CODES } from './result';
import { stepSourceFor } from './methods';
import { fastNormalDrawSource, normalDrawSource, normalSlowPathSource } from './random/ziggurat';

/**
 * Builds the source of the per-run kernel: ONE function holding the whole path loop, with drift
 * and diffusion inlined, states and generator state in local variables, the ziggurat's fast path
 * inlined for every noise draw. Paths are simulated one at a time over all steps (path-major), so
 * the state stays in registers. The sources it splices in come from the expression compiler's
 * checked trees (see plan.ts), never from user text; numbers are written as literals here.
 */

/** A JavaScript literal for a number (finite or ±Infinity), safe to splice into an expression. */
export function numberLiteral(value: number): string {
  if (Number.isNaN(value)) return 'NaN';
  if (value === Infinity) return 'Infinity';
  if (value === -Infinity) return '(-Infinity)';
  return Object.is(value, -0) || value < 0 ? `(${String(value)})` : String(value);
}

/** Time at the end of step n, for records; computed only when something is recorded. */
const END_OF_STEP = '(t0 + n * h)';

function range(count: number): number[] {
  return Array.from({ length: count }, (_, i) => i);
}

interface Parts {
  declarations: string;
  /** The increments dw0… from z0… (correlated through the Cholesky factor when needed). */
  increments: string;
  stepAndBoundaries: string;
  blowupTest: string;
  initialBoundaries: string;
  /** Updates of t (start of step) and tn (end of step), only where the step reads them. */
  timeUpdate: string;
}

function parts(plan: SimulationPlan, layout: PlanLayout, withInputs = false): Parts {
  const model = withInputs ? inputFormModel(plan) : plan.model;
  const d = layout.stateCount;
  const m = layout.noiseCount;
  const step = stepSourceFor(model, plan.method);
  const names = [
    ...range(d).flatMap((i) => [`s${i}`, `n${i}`, `mx${i}`, `mn${i}`, `ab${i}`, `abT${i}`]),
    ...range(m).flatMap((j) => [`z${j}`, `dw${j}`]),
    ...range(plan.watches.length).flatMap((w) => [`hw${w}`, `fp${w}`]),
    ...step.temporaries,
  ];
  const declarations = `let ${names.map((name) => `${name} = 0.0`).join(', ')};`;

  const increments = range(m).map((j) => {
    if (layout.cholesky === null) return `dw${j} = sqh * z${j};`;
    const terms = range(j + 1)
      .filter((k) => layout.cholesky![j * m + k] !== 0)
      .map((k) => `${numberLiteral(layout.cholesky![j * m + k]!)} * z${k}`);
    return `dw${j} = sqh * (${terms.length > 0 ? terms.join(' + ') : '0'});`;
  });

  const boundaryAt = (when: string): string =>
    plan.boundaries
      .map((rule, i) => {
        if (rule.rule === 'none') return '';
        const level = numberLiteral(rule.level);
        const beyond = rule.side === 'above' ? `s${i} >= ${level}` : `s${i} <= ${level}`;
        if (rule.rule === 'absorb') {
          return `if (ab${i} === 1) s${i} = ${level}; else if (${beyond}) { s${i} = ${level}; ab${i} = 1; abT${i} = ${when}; }`;
        }
        const strictlyBeyond = rule.side === 'above' ? `s${i} > ${level}` : `s${i} < ${level}`;
        return `if (${strictlyBeyond}) s${i} = ${level} + ${level} - s${i};`;
      })
      .filter((line) => line !== '')
      .join('\n');

  const assign = range(d)
    .map((i) => `s${i} = n${i};`)
    .join(' ');
  const bound = plan.blowupBound === null ? null : numberLiteral(plan.blowupBound);
  const blowupTest = range(d)
    .map((i) => (bound === null ? `!(Math.abs(s${i}) < Infinity)` : `!(Math.abs(s${i}) <= ${bound})`))
    .join(' || ');

  return {
    declarations,
    increments: increments.join('\n'),
    stepAndBoundaries: `${step.body}\n${assign}\n${boundaryAt(END_OF_STEP)}`,
    blowupTest,
    initialBoundaries: boundaryAt('t0'),
    timeUpdate: [
      /(?<![\w$.])t(?![\w$])/.test(step.body) ? 't = t0 + (n - 1) * h;' : '',
      /(?<![\w$.])tn(?![\w$])/.test(step.body) ? 'tn = t0 + n * h;' : '',
    ].join(' '),
  };
}

/** The model with the input form's coefficients, for a kernel that reads parameters per run. */
function inputFormModel(plan: SimulationPlan): SimulationPlan['model'] {
  const form = plan.model.inputForm!;
  return { ...plan.model, drift: form.drift, diffusion: form.diffusion };
}

/**
 * What a kernel with inputs reads from ctx.inputs, in this order: the input parameters' values,
 * the initial values, the watched levels, then 1 when every path starts within the blow-up
 * bound (see startsWithinBound), else 0. Literals in the plain kernel, so both give equal bits.
 */
export function kernelInputs(plan: SimulationPlan, layout: PlanLayout): Float64Array {
  const form = plan.model.inputForm;
  if (form === undefined) return new Float64Array(0);
  return Float64Array.from([
    ...form.names.map((name) => plan.model.params[name] ?? NaN),
    ...plan.model.initial,
    ...layout.watchLevels,
    startsWithinBound(plan) ? 1 : 0,
  ]);
}

function initialValues(plan: SimulationPlan, withInputs = false): string {
  const offset = plan.model.inputForm?.names.length ?? 0;
  return plan.model.initial
    .map((value, i) => `s${i} = ${withInputs ? `K.inputs[${offset + i}]` : numberLiteral(value)};`)
    .join(' ');
}

function watchUpdates(plan: SimulationPlan, layout: PlanLayout, time: string, withInputs = false): string {
  return plan.watches
    .map((watch, w) => {
      const level = withInputs ? `wl${w}` : numberLiteral(layout.watchLevels[w]!);
      const reached =
        watch.direction === 'below' ? `s${watch.state} <= ${level}` : `s${watch.state} >= ${level}`;
      return `if (hw${w} === 0 && ${reached}) { hw${w} = 1; fp${w} = ${time}; }`;
    })
    .join('\n');
}

/**
 * Cause of a lost path from its state at the step it was lost (cold path, once per lost path):
 * any state not a number means a coefficient was evaluated outside its domain (square root or
 * logarithm of a negative number, 0/0); else any infinite state is an overflow or a division by
 * zero; else the state left the blow-up bound. The codes are LOSS_CAUSE_CODES (result.ts).
 */
function lossCauseSource(d: number): string {
  const states = range(d);
  const notANumber = states.map((i) => `s${i} !== s${i}`).join(' || ');
  const infinite = states.map((i) => `Math.abs(s${i}) === Infinity`).join(' || ');
  return `(${notANumber}) ? ${LOSS_CAUSE_CODES.domain} : (${infinite}) ? ${LOSS_CAUSE_CODES.infinite} : ${LOSS_CAUSE_CODES.bound}`;
}

/**
 * Paths at least this long also poll ctx.shouldStop every STOP_CHECK_MASK + 1 steps (a few ms of
 * work), so a cancel lands within 200 ms even when one path is a long batch of work.
 */
const LONG_PATH_STEPS = 1 << 17;
const STOP_CHECK_MASK = (1 << 16) - 1;

/**
 * The state every path starts from, after the boundary rules at t0 (the same arithmetic as the
 * generated code), and whether all of it lies within the blow-up bound.
 */
export function startsWithinBound(plan: SimulationPlan): boolean {
  return plan.model.initial.every((value, i) => {
    let s = value;
    const rule = plan.boundaries[i];
    if (rule !== undefined && rule.rule !== 'none') {
      const level = rule.level;
      if (rule.rule === 'absorb') {
        if (rule.side === 'above' ? s >= level : s <= level) s = level;
      } else if (rule.side === 'above' ? s > level : s < level) {
        s = level + level - s;
      }
    }
    return plan.blowupBound === null ? Math.abs(s) < Infinity : Math.abs(s) <= plan.blowupBound;
  });
}

/** Constants of a kernel with inputs: pv{k} (parameters), wl{w} (watched levels), within. */
function inputDeclarations(plan: SimulationPlan): string {
  const form = plan.model.inputForm!;
  const d = plan.model.stateNames.length;
  const watchStart = form.names.length + d;
  const names = [
    ...form.names.map((_, k) => `pv${k} = K.inputs[${k}]`),
    ...plan.watches.map((_, w) => `wl${w} = K.inputs[${watchStart + w}]`),
    `within = K.inputs[${watchStart + plan.watches.length}] === 1`,
  ];
  return `const ${names.join(', ')};`;
}

/**
 * Source of a function body that returns `kernel(ctx)`: the kernel simulates paths ctx.pStart …
 * ctx.pEnd − 1 of a chunk (see KernelContext in kernel.ts for what ctx holds), writes the chunk's
 * arrays and returns ctx.pEnd, or the index of the path it was working on when a long path was
 * stopped (that path and the later ones are not done).
 *
 * Shape, for speed (V8): one function per path, made once per compiled kernel, so it is optimised
 * once as a plain function (not on-stack replacement) and stays optimised across chunks and runs;
 * the kernel holds the chunk's context only while it runs. the steps in segments that end at the next saved or probe step, and inside a
 * segment a loop whose only call-free exit besides its end is the ziggurat's rare branch: a draw
 * that needs it leaves the loop, is finished outside (one call), and that step is completed there;
 * then the loop resumes. With no call in the hot loop the generator state stays in registers.
 * Running extremes and the blow-up test are checked only when a state leaves [min, max] seen so
 * far: while it stays inside, neither can change (max and min start inside the blow-up bound, see
 * startsWithinBound, else every step is tested).
 */
export function buildKernelSource(plan: SimulationPlan, layout: PlanLayout): string {
  const d = layout.stateCount;
  const m = layout.noiseCount;
  const inputs = plan.model.inputForm !== undefined;
  const p = parts(plan, layout, inputs);
  const states = range(d);
  const save = states.map((i) => `saved[(k * ${d} + ${i}) * pathCount + p] = s${i};`).join(' ');
  const saveNaN = states.map((i) => `saved[(k * ${d} + ${i}) * pathCount + p] = NaN;`).join(' ');
  const probe = states.map((i) => `probeValues[(j * ${d} + ${i}) * pathCount + p] = s${i};`).join(' ');
  const probeNaN = states.map((i) => `probeValues[(j * ${d} + ${i}) * pathCount + p] = NaN;`).join(' ');
  const running = states
    .map((i) => `if (s${i} > mx${i}) mx${i} = s${i}; if (s${i} < mn${i}) mn${i} = s${i};`)
    .join('\n');
  const absorbing = plan.boundaries.map((rule, i) => (rule.rule === 'absorb' ? i : -1)).filter((i) => i >= 0);
  const longPaths = plan.steps >= LONG_PATH_STEPS;

  const extremes = plan.recordExtremes !== false;
  const blowupAndRunning = `if (${p.blowupTest}) { blown = true; break seg; }\n${extremes ? running : ''}`;
  const outsideSeen = states.map((i) => `s${i} <= mx${i} && s${i} >= mn${i}`).join(' && ');
  // The skip below leans on the running extremes: without them, every step is tested. With
  // inputs, whether paths start within the bound is read per run (the `within` input).
  const checks = !extremes
    ? blowupAndRunning
    : inputs
      ? `if (!within || !(${outsideSeen})) {\n${blowupAndRunning}\n}`
      : startsWithinBound(plan)
        ? `if (!(${outsideSeen})) {\n${blowupAndRunning}\n}`
        : blowupAndRunning;
  /** The step after its draws: increments, scheme, boundaries, checks, watches. */
  const stepTail = `${p.increments}\n${p.stepAndBoundaries}\n${checks}\n${watchUpdates(plan, layout, END_OF_STEP, inputs)}`;
  const fastDraws = range(m)
    .map((j) => fastNormalDrawSource(`z${j}`, `slow = ${j}; break;`))
    .join('\n');
  // After the hot loop left at draw `slow`: finish that draw, make the later ones in full.
  const finishDraws = range(m)
    .map((j) => {
      const finish = `if (slow === ${j}) { ${normalSlowPathSource(`z${j}`)} }`;
      return j === 0 ? finish : `${finish} else if (slow < ${j}) { ${normalDrawSource(`z${j}`)} }`;
    })
    .join('\n');
  const segmentSteps =
    m === 0
      ? `for (; n <= end; n++) {\n${p.timeUpdate}\n${stepTail}\n}`
      : `while (n <= end) {
      for (; n <= end; n++) {
${p.timeUpdate}
${fastDraws}
${stepTail}
      }
      if (n > end) break;
${finishDraws}
${stepTail}
      n++;
    }`;

  return `"use strict";
${EXPRESSION_PRELUDE}
let K = null;
function runPath(p) {
  const zt = K.zt, gen = K.gen, normalSlowPath = K.normalSlowPath, seedState = K.seedState;
  const saved = K.saved, probeValues = K.probeValues, saveSteps = K.saveSteps, probeSteps = K.probeStepsSorted, probeOrder = K.probeOrder;
  const pathCount = K.pathCount;
  const t0 = ${numberLiteral(plan.t0)}, h = ${numberLiteral(layout.h)}, steps = ${plan.steps};
  const sqh = Math.sqrt(h), halfInvSqh = 0.5 / sqh;
  ${inputs ? inputDeclarations(plan) : ''}
  let x0 = 0, x1 = 0, x2 = 0, x3 = 0, r = 0, xt = 0, iz = 0, rf = 0.0, slow = 0;
  let t = t0, tn = t0, n = 0, k = 0, q = 0, j = 0, end = 0, nextSave = 0, nextProbe = 0, blown = false;
  ${p.declarations}
  K.streamSeed(K.seed, K.firstPath + p, seedState, 0);
  x0 = seedState[0] | 0; x1 = seedState[1] | 0; x2 = seedState[2] | 0; x3 = seedState[3] | 0;
  ${initialValues(plan, inputs)}
  ${states.map((i) => `ab${i} = 0; abT${i} = NaN;`).join(' ')}
  ${plan.watches.map((_, w) => `hw${w} = 0; fp${w} = NaN;`).join(' ')}
  ${p.initialBoundaries}
  ${states.map((i) => `mx${i} = s${i}; mn${i} = s${i};`).join(' ')}
  ${watchUpdates(plan, layout, 't0', inputs)}
  while (saveSteps[k] === 0) { ${save} k++; }
  while (probeSteps[q] === 0) { j = probeOrder[q]; ${probe} q++; }
  n = 1;
  seg: for (;;) {
    nextSave = saveSteps[k]; nextProbe = probeSteps[q]; end = steps;
    if (nextSave >= 0 && nextSave < end) end = nextSave;
    if (nextProbe >= 0 && nextProbe < end) end = nextProbe;
    ${longPaths ? `if (end > ((n + ${STOP_CHECK_MASK}) & ${~STOP_CHECK_MASK})) end = (n + ${STOP_CHECK_MASK}) & ${~STOP_CHECK_MASK};` : ''}
    ${segmentSteps}
    if (end === nextSave) { do { ${save} k++; } while (saveSteps[k] === end); }
    if (end === nextProbe) { do { j = probeOrder[q]; ${probe} q++; } while (probeSteps[q] === end); }
    if (end === steps) break;
    ${longPaths ? `if ((end & ${STOP_CHECK_MASK}) === 0 && K.shouldStop()) return false;` : ''}
  }
  if (blown) {
    K.blowupTime[p] = t0 + n * h;
    K.lossCause[p] = ${lossCauseSource(d)};
    for (; saveSteps[k] >= 0; k++) { ${saveNaN} }
    for (; probeSteps[q] >= 0; q++) { j = probeOrder[q]; ${probeNaN} }
  } else {
    K.blowupTime[p] = NaN;
    K.lossCause[p] = ${LOSS_CAUSE_CODES.none};
  }
  ${states.map((i) => (extremes ? `K.runningMax[${i} * pathCount + p] = mx${i}; K.runningMin[${i} * pathCount + p] = mn${i};` : `K.runningMax[${i} * pathCount + p] = NaN; K.runningMin[${i} * pathCount + p] = NaN;`)).join('\n  ')}
  ${plan.watches.map((_, w) => `K.firstPassage[${w} * pathCount + p] = fp${w};`).join(' ')}
  ${states.map((i) => `K.absorptionTime[${i} * pathCount + p] = ${absorbing.includes(i) ? `abT${i}` : 'NaN'};`).join(' ')}
  return true;
}
return function kernel(ctx) {
  K = ctx;
  const pEnd = ctx.pEnd;
  let p = ctx.pStart;
  while (p < pEnd && runPath(p)) p++;
  K = null;
  return p;
};
`;
}

/**
 * Source of `incrementKernel(ctx)` for step-size studies: runs ONE path from the initial values
 * with the increments ctx.increments[(n − 1)·m + j] (already correlated and scaled), ctx.steps
 * steps of size ctx.h, writes the final state into ctx.out and returns 1 if the path blew up
 * (then ctx.out holds NaN), else 0.
 */
export function buildIncrementKernelSource(plan: SimulationPlan, layout: PlanLayout): string {
  const d = layout.stateCount;
  const m = layout.noiseCount;
  const p = parts(plan, layout);
  const states = range(d);
  return `"use strict";
${EXPRESSION_PRELUDE}
const increments = ctx.increments, out = ctx.out, steps = ctx.steps, h = ctx.h;
const t0 = ${numberLiteral(plan.t0)}, sqh = Math.sqrt(h), halfInvSqh = 0.5 / sqh;
let t = t0, tn = t0, n = 0;
${p.declarations}
${initialValues(plan)}
${p.initialBoundaries}
for (n = 1; n <= steps; n++) {
  ${p.timeUpdate}
  ${range(m)
    .map((j) => `dw${j} = increments[(n - 1) * ${m} + ${j}];`)
    .join(' ')}
  ${p.stepAndBoundaries}
  if (${p.blowupTest}) { ${states.map((i) => `out[${i}] = NaN;`).join(' ')} return 1; }
}
${states.map((i) => `out[${i}] = s${i};`).join(' ')}
return 0;
`;
}
