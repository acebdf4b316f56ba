// Over 300 lines on purpose: like codegen.ts, the kernel is built in one place so its order of
// operations (which must match the JavaScript kernel's, bit for bit) reads from top to bottom.
import type { SimulationPlan } from '../plan';
import type { PlanLayout } from '../layout';
import { stepSourceFor } from '../methods';
import { LOSS_CAUSE_CODES } from '../result';
import { startsWithinBound } from '../codegen';
import { FunctionBody, ModuleBuilder } from './emitter';
import { F64, I32, OP, SIMD, V128, type ValueType } from './opcodes';
import { CALLED_OUT, LaneEmitter, type LaneFunctions } from './lanes';
import {
  ALIVE_OFFSET,
  FINISH_OFFSET,
  FIRST_OUTPUT_OFFSET,
  STATE_OFFSET,
  STATE_VECTORS,
  STEP_OFFSET,
  HEADER_FIELDS,
  HEADER_OFFSET,
  POOL_OFFSET,
  POOL_SIZE,
  SEED_OFFSET,
  type HeaderField,
} from './memory-layout';
import { parseAssignments, namesRead, Unsupported, type Assignment } from './source-tree';
import { PORTED_FUNCTIONS } from './fdlibm';
import { finishLanes } from './ziggurat-wasm';
import { declareDrawLocals, DrawEmitter } from './draw-wasm';
import { declareSeedLocals, emitGroupSeeds } from './seed-wasm';

/**
 * The wasm kernel of a plan: `run(g0, g1)` simulates path groups g0 … g1 − 1 (four paths per
 * group, p = 4g … 4g + 3 of the chunk) and returns the group it reached (g1 unless a long path
 * was stopped). Paths are simulated four at a time: xoshiro128** on i32x4 (one stream per lane,
 * seeded as the JavaScript kernel seeds a path: seed-wasm.ts), the ziggurat's fast test
 * for four lanes with the table read per lane, and the state as two f64x2 halves per variable.
 * The draws are draw-wasm.ts: the ziggurat's rare branch runs on four lanes in the loop, except
 * the base layer's tail, which the hot loop leaves to `finish` (finishLanes in ziggurat-wasm.ts)
 * and then resumes. A lane that is lost (not a number, infinite, beyond the bound) has its records
 * written at that step and is masked out after.
 */

/** Imported functions, in import order. */
const IMPORT_SHOULD_STOP = 0;

export interface WasmKernelModule {
  bytes: Uint8Array<ArrayBuffer>;
  /** Helper functions called out to JavaScript, with their import names (`lib.<name>/<arity>`). */
  callOuts: { fn: string; arity: number }[];
  /** The constant pool: value i is written to both lanes of the f64x2 at POOL_OFFSET + 16·i. */
  constants: number[];
}

const LONG_PATH_STEPS = 1 << 17;
/** What the hot function returns. */
const HOT_PATH_DONE = 0;
const HOT_ALL_LOST = 1;
const HOT_STOP_CHECK = 2;
const HOT_FINISH_DRAW = 3;
const STOP_CHECK_MASK = (1 << 16) - 1;
const HALVES = [0, 1] as const;

function range(count: number): number[] {
  return Array.from({ length: count }, (_, i) => i);
}

interface StepPlan {
  assignments: Assignment[];
  temporaries: string[];
  readsT: boolean;
  readsTn: boolean;
}

function stepPlan(plan: SimulationPlan, layout: PlanLayout): StepPlan {
  const d = layout.stateCount;
  const m = layout.noiseCount;
  const step = stepSourceFor(plan.model, plan.method);
  const names = new Set<string>(['h', 'sqh', 'halfInvSqh', 't', 'tn']);
  for (let i = 0; i < d; i++) names.add(`s${i}`);
  for (let j = 0; j < m; j++) names.add(`dw${j}`);
  for (const temporary of step.temporaries) {
    if (!/^(a\d+|b\d+|b\d+_\d+|u\d+)$/.test(temporary))
      throw new Unsupported(`the scheme's temporary ${temporary} is not known to the wasm kernel`);
    names.add(temporary);
  }
  const assignments = parseAssignments(step.body, names, /^(n\d+|a\d+|b\d+|b\d+_\d+|u\d+)$/);
  const read = new Set<string>();
  for (const a of assignments) {
    LaneEmitter.check(a.value);
    namesRead(a.value, read);
    if (!names.has(a.target) && !/^n\d+$/.test(a.target))
      throw new Unsupported(`the step assigns ${a.target}`);
    if (/^n\d+$/.test(a.target) && Number(a.target.slice(1)) >= d)
      throw new Unsupported(`the step assigns ${a.target}`);
  }
  return { assignments, temporaries: step.temporaries, readsT: read.has('t'), readsTn: read.has('tn') };
}

export function buildWasmKernel(plan: SimulationPlan, layout: PlanLayout): WasmKernelModule {
  const d = layout.stateCount;
  const m = layout.noiseCount;
  const W = plan.watches.length;
  const step = stepPlan(plan, layout);
  const within = startsWithinBound(plan);
  const longPaths = plan.steps >= LONG_PATH_STEPS;
  const absorbing = plan.boundaries.map((rule) => rule.rule === 'absorb');
  const extremes = plan.recordExtremes !== false;

  const mod = new ModuleBuilder();
  mod.importFunction('engine', 'shouldStop', [], [I32]);
  const callOuts: { fn: string; arity: number }[] = [];
  const callOutIndex = new Map<string, number>();
  // Imports must come first: declare every helper the step may call out to.
  const calls = new Set<string>();
  const collect = (node: unknown): void => {
    if (node === null || typeof node !== 'object') return;
    const n = node as { kind?: string; fn?: string; args?: unknown[] };
    if (n.kind === 'call' && CALLED_OUT.has(n.fn!) && !PORTED_FUNCTIONS.has(n.fn!))
      calls.add(`${n.fn}/${n.args!.length}`);
    Object.values(node).forEach(collect);
  };
  step.assignments.forEach((a) => collect(a.value));
  for (const key of [...calls].sort()) {
    const [fn, arity] = key.split('/') as [string, string];
    const params: ValueType[] = Array.from({ length: Number(arity) }, () => F64);
    callOutIndex.set(key, mod.importFunction('lib', key, params, [F64]));
    callOuts.push({ fn, arity: Number(arity) });
  }
  const runIndex = mod.declareFunction([I32, I32], [I32], 'run');
  const hotIndex = mod.declareFunction([], [I32]);
  const finishIndex = mod.declareFunction([I32, I32], []);

  const runBody = new FunctionBody(
    [
      ['g0', I32],
      ['g1', I32],
    ],
    [I32],
  );
  const hotBody = new FunctionBody([], [I32]);
  // The helpers below write into `f`, the function being emitted (run, then the hot loop).
  let f = runBody;
  const constants: number[] = [];
  const constantIndex = new Map<string, number>();
  const constant = (value: number): void => {
    const key = Object.is(value, -0) ? '-0' : String(value);
    let index = constantIndex.get(key);
    if (index === undefined && constants.length < POOL_SIZE) {
      index = constants.length;
      constants.push(value);
      constantIndex.set(key, index);
    }
    if (index === undefined) f.f64x2(value);
    else f.i32(0).v128Load(POOL_OFFSET + 16 * index);
  };
  const h = layout.h;
  const sqh = Math.sqrt(h);
  const laneFunctions: LaneFunctions = {
    constant,
    namedConstants: new Map([
      ['h', h],
      ['sqh', sqh],
      ['halfInvSqh', 0.5 / sqh],
    ]),
    callOut: (fn, arity) => {
      const index = callOutIndex.get(`${fn}/${arity}`);
      if (index === undefined) throw new Error(`no import for ${fn}/${arity}`);
      return index;
    },
  };
  let lanes = new LaneEmitter(f, laneFunctions);

  const vectorNames = [
    ...range(d).flatMap((i) => [`s${i}`, `n${i}`, `mx${i}`, `mn${i}`, `ab${i}`, `abT${i}`]),
    ...range(m).flatMap((j) => [`z${j}`, `dw${j}`]),
    ...range(W).flatMap((w) => [`hw${w}`, `fp${w}`]),
    ...step.temporaries,
    't',
    'tn',
    'tEndV',
    'blown',
  ];
  const declareLocals = (): void => {
    declareDrawLocals(f);
    declareSeedLocals(f);
    for (const name of ['g', 'p', 'n', 'k', 'q', 'j', 'end', 'nextSave', 'nextProbe', 'a', 'resume'])
      f.local(name, I32);
    for (const field of HEADER_FIELDS) f.local(`base_${field}`, I32);
    f.local('tEnd', F64);
    f.local('blownAny', V128);
    for (const name of vectorNames) for (const half of HALVES) f.local(`${name}#${half}`, V128);
  };
  declareLocals();

  const bound = plan.blowupBound;
  /** The alive mask of a half, kept in memory (see ALIVE_OFFSET). */
  const alive = (half: number): void => void f.i32(0).v128Load(ALIVE_OFFSET + 16 * half);
  const base = (field: HeaderField): void => void f.get(`base_${field}`);
  const splatBoth = (name: string, emit: () => void): void => {
    for (const half of HALVES) {
      emit();
      f.set(`${name}#${half}`);
    }
  };
  const constBoth = (name: string, value: number): void => splatBoth(name, () => f.f64x2(value));
  /** tEnd = t0 + n·h (time at the end of step n), as a scalar and both halves of tEndV. */
  const endTime = (): void => {
    f.f64(plan.t0).get('n').op(OP.f64ConvertI32S).f64(h).op(OP.f64Mul).op(OP.f64Add).set('tEnd');
    splatBoth('tEndV', () => f.get('tEnd').simd(SIMD.f64x2Splat));
  };
  /** Byte address of element `index()` (a path-major row) of an output: base + 8·index. */
  const address = (field: HeaderField, index: () => void): void => {
    index();
    f.i32(8).op(OP.i32Mul);
    base(field);
    f.op(OP.i32Add);
  };
  /** row·paddedPaths + p (+ 2·half), the element of a group half in a path-major row. */
  const rowIndex = (row: () => void, half: number): void => {
    row();
    base('paddedPaths');
    f.op(OP.i32Mul).get('p').op(OP.i32Add);
    if (half) f.i32(2).op(OP.i32Add);
  };

  // --- boundaries (codegen.ts boundaryAt) ---
  const boundaries = (time: string): void => {
    plan.boundaries.forEach((rule, i) => {
      if (rule.rule === 'none') return;
      for (const half of HALVES) {
        const s = `s${i}#${half}`;
        const ab = `ab${i}#${half}`;
        if (rule.rule === 'absorb') {
          // newly = beyond & !ab; ab |= newly; s = ab ? level : s; abT = newly ? time : abT
          f.get(s)
            .f64x2(rule.level)
            .simd(rule.side === 'above' ? SIMD.f64x2Ge : SIMD.f64x2Le);
          f.get(ab).simd(SIMD.v128AndNot).set('blownAny');
          f.get(`${time}#${half}`).get(`abT${i}#${half}`).get('blownAny').simd(SIMD.v128Bitselect);
          f.set(`abT${i}#${half}`);
          f.get(ab).get('blownAny').simd(SIMD.v128Or).set(ab);
          f.f64x2(rule.level).get(s).get(ab).simd(SIMD.v128Bitselect).set(s);
        } else {
          f.f64x2(rule.level + rule.level)
            .get(s)
            .simd(SIMD.f64x2Sub)
            .get(s);
          f.get(s)
            .f64x2(rule.level)
            .simd(rule.side === 'above' ? SIMD.f64x2Gt : SIMD.f64x2Lt);
          f.simd(SIMD.v128Bitselect).set(s);
        }
      }
    });
  };
  const watches = (time: string): void => {
    plan.watches.forEach((watch, w) => {
      const level = layout.watchLevels[w]!;
      for (const half of HALVES) {
        f.get(`s${watch.state}#${half}`).f64x2(level);
        f.simd(watch.direction === 'below' ? SIMD.f64x2Le : SIMD.f64x2Ge);
        f.get(`hw${w}#${half}`).simd(SIMD.v128AndNot).set('blownAny');
        f.get(`${time}#${half}`).get(`fp${w}#${half}`).get('blownAny').simd(SIMD.v128Bitselect);
        f.set(`fp${w}#${half}`);
        f.get(`hw${w}#${half}`).get('blownAny').simd(SIMD.v128Or).set(`hw${w}#${half}`);
      }
    });
  };

  // --- saves and probe captures ---
  const storeStates = (field: 'saved' | 'probeValues', row: string, nan: boolean): void => {
    for (let i = 0; i < d; i++) {
      for (const half of HALVES) {
        address(field, () => rowIndex(() => f.get(row).i32(d).op(OP.i32Mul).i32(i).op(OP.i32Add), half));
        if (nan) f.f64x2(Number.NaN);
        else {
          f.get(`s${i}#${half}`).f64x2(Number.NaN);
          alive(half);
          f.simd(SIMD.v128Bitselect);
        }
        f.v128Store();
      }
    }
  };
  const loadStep = (field: HeaderField, index: string): void => {
    f.get(index).i32(4).op(OP.i32Mul);
    base(field);
    f.op(OP.i32Add).load(OP.i32Load, 2);
  };
  const probeRow = (): void => {
    loadStep('probeOrder', 'q');
    f.set('j');
  };

  // --- the step after its draws (codegen.ts stepTail) ---
  const increments = (): void => {
    for (let j = 0; j < m; j++) {
      for (const half of HALVES) {
        constant(sqh);
        if (layout.cholesky === null) {
          f.get(`z${j}#${half}`);
        } else {
          const terms = range(j + 1).filter((k) => layout.cholesky![j * m + k] !== 0);
          if (terms.length === 0) f.f64x2(0);
          terms.forEach((k, at) => {
            constant(layout.cholesky![j * m + k]!);
            f.get(`z${k}#${half}`).simd(SIMD.f64x2Mul);
            if (at > 0) f.simd(SIMD.f64x2Add);
          });
        }
        f.simd(SIMD.f64x2Mul).set(`dw${j}#${half}`);
      }
    }
  };
  const recordLoss = (lane: number): void => {
    const half = lane >> 1;
    const sub = lane & 1;
    const at = (field: HeaderField, row: number): void =>
      address(field, () => {
        f.i32(row);
        base('paddedPaths');
        f.op(OP.i32Mul).get('p').op(OP.i32Add).i32(lane).op(OP.i32Add);
      });
    const laneOf = (name: string): void => void f.get(`${name}#${half}`).lane(SIMD.f64x2ExtractLane, sub);
    at('lossTime', 0);
    f.get('tEnd').store(OP.f64Store, 3);
    // Cause (codegen.ts lossCauseSource): not a number, else infinite, else beyond the bound.
    f.i32(0);
    base('lossCause');
    f.op(OP.i32Add).get('p').op(OP.i32Add).i32(lane).op(OP.i32Add);
    f.i32(LOSS_CAUSE_CODES.domain).i32(LOSS_CAUSE_CODES.infinite).i32(LOSS_CAUSE_CODES.bound);
    range(d).forEach((i, at2) => {
      laneOf(`s${i}`);
      f.op(OP.f64Abs).f64(Infinity).op(OP.f64Eq);
      if (at2 > 0) f.op(OP.i32Or);
    });
    f.op(OP.select);
    range(d).forEach((i, at2) => {
      laneOf(`s${i}`);
      laneOf(`s${i}`);
      f.op(OP.f64Ne);
      if (at2 > 0) f.op(OP.i32Or);
    });
    f.op(OP.select).store(OP.i32Store8, 0);
    for (let i = 0; i < d; i++) {
      at('runningMax', i);
      if (extremes) laneOf(`mx${i}`);
      else f.f64(Number.NaN);
      f.store(OP.f64Store, 3);
      at('runningMin', i);
      if (extremes) laneOf(`mn${i}`);
      else f.f64(Number.NaN);
      f.store(OP.f64Store, 3);
      at('absorptionTime', i);
      if (absorbing[i]) laneOf(`abT${i}`);
      else f.f64(Number.NaN);
      f.store(OP.f64Store, 3);
    }
    for (let w = 0; w < W; w++) {
      at('firstPassage', w);
      laneOf(`fp${w}`);
      f.store(OP.f64Store, 3);
    }
  };
  /** Records the lanes in blown#… as lost at this step. */
  const lost = (allLost: () => void): void => {
    endTime();
    for (let lane = 0; lane < 4; lane++) {
      f.get(`blown#${lane >> 1}`)
        .lane(SIMD.i64x2ExtractLane, lane & 1)
        .op(OP.i32WrapI64);
      f.if(() => recordLoss(lane));
    }
    for (const half of HALVES) {
      f.i32(0);
      alive(half);
      f.get(`blown#${half}`)
        .simd(SIMD.v128AndNot)
        .v128Store(ALIVE_OFFSET + 16 * half);
      // A lost lane goes on with a finite state, masked out, so it does not keep the cold path busy.
      for (let i = 0; i < d; i++) {
        constant(plan.model.initial[i]!);
        f.get(`s${i}#${half}`).get(`blown#${half}`).simd(SIMD.v128Bitselect);
        f.set(`s${i}#${half}`);
      }
    }
    alive(0);
    alive(1);
    f.simd(SIMD.v128Or).simd(SIMD.v128AnyTrue).op(OP.i32Eqz);
    f.if(allLost);
  };
  const lossChecks = (allLost: () => void): void => {
    // out = some state not within the bound (not a number, infinite: s − s is not 0), per half;
    // blown = alive & out, looked at only when some lane is out.
    for (const half of HALVES) {
      range(d).forEach((i, at) => {
        if (bound === null) {
          f.get(`s${i}#${half}`).get(`s${i}#${half}`).simd(SIMD.f64x2Sub).f64x2(0).simd(SIMD.f64x2Ne);
        } else {
          f.get(`s${i}#${half}`).simd(SIMD.f64x2Abs).f64x2(bound).simd(SIMD.f64x2Le).simd(SIMD.v128Not);
        }
        if (at > 0) f.simd(SIMD.v128Or);
      });
      f.set(`blown#${half}`);
    }
    f.get('blown#0').get('blown#1').simd(SIMD.v128Or).simd(SIMD.v128AnyTrue);
    f.if(() => {
      for (const half of HALVES) {
        alive(half);
        f.get(`blown#${half}`).simd(SIMD.v128And).set(`blown#${half}`);
      }
      f.get('blown#0').get('blown#1').simd(SIMD.v128Or).simd(SIMD.v128AnyTrue);
      f.if(() => lost(allLost));
    });
    if (extremes)
      for (const half of HALVES) {
        for (let i = 0; i < d; i++) {
          f.get(`mx${i}#${half}`).get(`s${i}#${half}`).simd(SIMD.f64x2Pmax).set(`mx${i}#${half}`);
          f.get(`mn${i}#${half}`).get(`s${i}#${half}`).simd(SIMD.f64x2Pmin).set(`mn${i}#${half}`);
        }
      }
  };
  const stepTail = (allLost: () => void): void => {
    increments();
    for (const a of step.assignments) {
      for (const half of HALVES) {
        lanes.value(a.value, half);
        f.set(`${a.target}#${half}`);
      }
    }
    for (let i = 0; i < d; i++) for (const half of HALVES) f.get(`n${i}#${half}`).set(`s${i}#${half}`);
    const needsEndTime = absorbing.some(Boolean) || W > 0;
    if (needsEndTime) endTime();
    boundaries('tEndV');
    if (within && extremes) {
      // Extremes and bounds can only change when a state leaves [min, max] seen so far.
      for (const half of HALVES) {
        range(d).forEach((i, at) => {
          f.get(`s${i}#${half}`).get(`mx${i}#${half}`).simd(SIMD.f64x2Le);
          f.get(`s${i}#${half}`).get(`mn${i}#${half}`).simd(SIMD.f64x2Ge).simd(SIMD.v128And);
          if (at > 0) f.simd(SIMD.v128And);
        });
        if (half === 1) f.simd(SIMD.v128And);
      }
      f.simd(SIMD.i64x2AllTrue).op(OP.i32Eqz);
      f.if(() => lossChecks(allLost));
    } else {
      lossChecks(allLost);
    }
    watches('tEndV');
  };
  const timeUpdate = (): void => {
    if (step.readsT) {
      f.f64(plan.t0).get('n').i32(1).op(OP.i32Sub).op(OP.f64ConvertI32S).f64(h).op(OP.f64Mul);
      f.op(OP.f64Add).set('tEnd');
      splatBoth('t', () => f.get('tEnd').simd(SIMD.f64x2Splat));
    }
    if (step.readsTn) {
      endTime();
      splatBoth('tn', () => f.get('tEndV#0'));
    }
  };

  // --- a group's vectors in memory between calls of the hot loop ---
  const persisted = [
    'x0',
    'x1',
    'x2',
    'x3',
    ...[
      ...range(d).flatMap((i) => [
        `s${i}`,
        ...(extremes ? [`mx${i}`, `mn${i}`] : []),
        ...(absorbing[i] ? [`ab${i}`, `abT${i}`] : []),
      ]),
      ...range(W).flatMap((w) => [`hw${w}`, `fp${w}`]),
      // The step's draws, for a step the finisher interrupts.
      ...range(m).map((j) => `z${j}`),
    ].flatMap((name) => HALVES.map((half) => `${name}#${half}`)),
  ];
  /** Where a persisted vector is kept between calls (the generator first: finishLanes reads it there). */
  const stateAddress = (name: string): number => STATE_OFFSET + 16 * persisted.indexOf(name);
  if (persisted.length > STATE_VECTORS)
    throw new Unsupported('the model has too many states for the wasm kernel');
  const storeState = (): void => {
    persisted.forEach((name, at) => {
      f.i32(0)
        .get(name)
        .v128Store(STATE_OFFSET + 16 * at);
    });
  };
  const loadState = (): void => {
    persisted.forEach((name, at) => {
      f.i32(0)
        .v128Load(STATE_OFFSET + 16 * at)
        .set(name);
    });
  };
  const loadHeader = (): void => {
    HEADER_FIELDS.forEach((field, w) => {
      f.i32(HEADER_OFFSET + 4 * w)
        .load(OP.i32Load, 2)
        .set(`base_${field}`);
    });
  };

  // --- the hot loop: hot() steps the group from where the last call left off (STEP_OFFSET) with
  // no call at all, so the register allocator keeps the generator and the states in registers. It
  // returns HOT_PATH_DONE at the last step, HOT_ALL_LOST when every lane was lost, HOT_STOP_CHECK
  // every 2^16 steps of a long path, or HOT_FINISH_DRAW when lanes of draw j are left to the
  // finisher (FINISH_OFFSET); the next call then resumes with the draws after j and the step's tail.
  const emitHot = (): void => {
    loadHeader();
    loadState();
    for (const [name, at] of [
      ['n', 0],
      ['k', 4],
      ['q', 8],
      ['p', 12],
    ] as const)
      f.i32(0)
        .load(OP.i32Load, 2, STEP_OFFSET + at)
        .set(name);
    f.block('exit', () => {
      f.i32(0).load(OP.i32Load, 2, FINISH_OFFSET).set('resume');
      f.get('resume').i32(0).op(OP.i32GeS);
      f.if(() => {
        // The rest of step n after the finisher's draw `resume`: later draws, then the tail.
        f.i32(0).i32(-1).store(OP.i32Store, 2, FINISH_OFFSET);
        timeUpdate();
        for (let j = 1; j < m; j++) {
          f.get('resume').i32(j).op(OP.i32LtS);
          f.if(() => draws.draw(j));
        }
        stepTail(() => f.i32(HOT_ALL_LOST).set('slow').br('exit'));
        f.get('n').i32(1).op(OP.i32Add).set('n');
      });
      f.loop('segment', () => {
        loadStep('saveSteps', 'k');
        f.set('nextSave');
        loadStep('probeSteps', 'q');
        f.set('nextProbe');
        f.i32(plan.steps).set('end');
        for (const next of ['nextSave', 'nextProbe']) {
          f.get(next).i32(0).op(OP.i32GeS).get(next).get('end').op(OP.i32LtS).op(OP.i32And);
          f.if(() => f.get(next).set('end'));
        }
        if (longPaths) {
          f.get('n').i32(STOP_CHECK_MASK).op(OP.i32Add).i32(~STOP_CHECK_MASK).op(OP.i32And).set('a');
          f.get('end').get('a').op(OP.i32GtS);
          f.if(() => f.get('a').set('end'));
        }
        f.block('segmentEnd', () => {
          f.loop('steps', () => {
            f.get('n').get('end').op(OP.i32GtS).brIf('segmentEnd');
            timeUpdate();
            for (let j = 0; j < m; j++) draws.draw(j);
            stepTail(() => f.i32(HOT_ALL_LOST).set('slow').br('exit'));
            f.get('n').i32(1).op(OP.i32Add).set('n').br('steps');
          });
        });
        f.get('end').get('nextSave').op(OP.i32Eq);
        f.if(() => {
          f.loop('saves', () => {
            storeStates('saved', 'k', false);
            f.get('k').i32(1).op(OP.i32Add).set('k');
            loadStep('saveSteps', 'k');
            f.get('end').op(OP.i32Eq).brIf('saves');
          });
        });
        f.get('end').get('nextProbe').op(OP.i32Eq);
        f.if(() => {
          f.loop('probes', () => {
            probeRow();
            storeStates('probeValues', 'j', false);
            f.get('q').i32(1).op(OP.i32Add).set('q');
            loadStep('probeSteps', 'q');
            f.get('end').op(OP.i32Eq).brIf('probes');
          });
        });
        f.i32(HOT_PATH_DONE).set('slow');
        f.get('end').i32(plan.steps).op(OP.i32Eq).brIf('exit');
        if (longPaths) {
          f.i32(HOT_STOP_CHECK).set('slow');
          f.get('end').i32(STOP_CHECK_MASK).op(OP.i32And).op(OP.i32Eqz).brIf('exit');
        }
        f.br('segment');
      });
    });
    storeState();
    for (const [name, at] of [
      ['n', 0],
      ['k', 4],
      ['q', 8],
    ] as const)
      f.i32(0)
        .get(name)
        .store(OP.i32Store, 2, STEP_OFFSET + at);
    f.get('slow');
  };
  f = hotBody;
  lanes = new LaneEmitter(f, laneFunctions);
  const draws = new DrawEmitter(f, {
    drawAddress: (j) => stateAddress(`z${j}#0`),
    leaveForFinisher: () => f.i32(HOT_FINISH_DRAW).set('slow').br('exit'),
  });
  declareLocals();
  emitHot();
  mod.define(hotIndex, hotBody);
  if (persisted.indexOf('x3') !== 3) throw new Error('the generator must be kept first (finishLanes)');
  mod.define(finishIndex, finishLanes(STATE_OFFSET, FIRST_OUTPUT_OFFSET));
  f = runBody;
  lanes = new LaneEmitter(f, laneFunctions);

  // --- the body ---
  loadHeader();
  constBoth('t', plan.t0);
  constBoth('tn', plan.t0);
  f.get('g0').set('g');
  f.block('done', () => {
    f.loop('groups', () => {
      f.get('g').get('g1').op(OP.i32GeS).brIf('done');
      f.get('g').i32(4).op(OP.i32Mul).set('p');
      emitGroupSeeds(f);
      ['x0', 'x1', 'x2', 'x3'].forEach((x, w) =>
        f
          .i32(0)
          .v128Load(SEED_OFFSET + 16 * w)
          .set(x),
      );
      plan.model.initial.forEach((value, i) => constBoth(`s${i}`, value));
      for (let i = 0; i < d; i++) {
        splatBoth(`ab${i}`, () => f.f64x2(0));
        constBoth(`abT${i}`, Number.NaN);
      }
      for (let w = 0; w < W; w++) {
        splatBoth(`hw${w}`, () => f.f64x2(0));
        constBoth(`fp${w}`, Number.NaN);
      }
      for (const half of HALVES)
        f.i32(0)
          .i64(-1n)
          .simd(SIMD.i64x2Splat)
          .v128Store(ALIVE_OFFSET + 16 * half);
      constBoth('tEndV', plan.t0);
      boundaries('tEndV');
      for (let i = 0; i < d; i++) {
        for (const half of HALVES) {
          f.get(`s${i}#${half}`).set(`mx${i}#${half}`);
          f.get(`s${i}#${half}`).set(`mn${i}#${half}`);
        }
      }
      watches('tEndV');
      f.i32(0).set('k').i32(0).set('q');
      const whileAt = (field: HeaderField, index: string, value: () => void, body: () => void): void => {
        f.block('w', () => {
          f.loop('wl', () => {
            loadStep(field, index);
            value();
            f.op(OP.i32Ne).brIf('w');
            body();
            f.get(index).i32(1).op(OP.i32Add).set(index).br('wl');
          });
        });
      };
      whileAt(
        'saveSteps',
        'k',
        () => f.i32(0),
        () => storeStates('saved', 'k', false),
      );
      whileAt(
        'probeSteps',
        'q',
        () => f.i32(0),
        () => {
          probeRow();
          storeStates('probeValues', 'j', false);
        },
      );
      f.i32(0).i32(1).store(OP.i32Store, 2, STEP_OFFSET);
      f.i32(0)
        .get('k')
        .store(OP.i32Store, 2, STEP_OFFSET + 4);
      f.i32(0)
        .get('q')
        .store(OP.i32Store, 2, STEP_OFFSET + 8);
      f.i32(0)
        .get('p')
        .store(OP.i32Store, 2, STEP_OFFSET + 12);
      f.i32(0).i32(-1).store(OP.i32Store, 2, FINISH_OFFSET);
      storeState();
      f.block('path', () => {
        f.loop('calls', () => {
          f.call(hotIndex).set('slow');
          f.get('slow').i32(HOT_FINISH_DRAW).op(OP.i32Eq);
          f.if(() => {
            for (const at of [4, 8]) f.i32(0).load(OP.i32Load, 2, FINISH_OFFSET + at);
            f.call(finishIndex).br('calls');
          });
          f.get('slow').i32(HOT_STOP_CHECK).op(OP.i32Ne).brIf('path');
          f.call(IMPORT_SHOULD_STOP);
          f.if(() => f.get('g').op(OP.return));
          f.br('calls');
        });
      });
      loadState();
      f.i32(0)
        .load(OP.i32Load, 2, STEP_OFFSET + 4)
        .set('k');
      f.i32(0)
        .load(OP.i32Load, 2, STEP_OFFSET + 8)
        .set('q');
      // Saves and probe times after every lane was lost hold NaN (codegen.ts).
      const fill = (field: HeaderField, index: string, body: () => void): void => {
        f.block('f', () => {
          f.loop('fl', () => {
            loadStep(field, index);
            f.i32(0).op(OP.i32LtS).brIf('f');
            body();
            f.get(index).i32(1).op(OP.i32Add).set(index).br('fl');
          });
        });
      };
      fill('saveSteps', 'k', () => storeStates('saved', 'k', true));
      fill('probeSteps', 'q', () => {
        probeRow();
        storeStates('probeValues', 'j', true);
      });
      // Records of the lanes still alive (lost lanes wrote theirs when they were lost).
      const record = (field: HeaderField, row: number, value: (half: number) => void): void => {
        for (const half of HALVES) {
          address(field, () => rowIndex(() => f.i32(row), half));
          f.tee('a');
          value(half);
          f.get('a').v128Load();
          alive(half);
          f.simd(SIMD.v128Bitselect).v128Store();
        }
      };
      for (let i = 0; i < d; i++) {
        record('runningMax', i, (half) => (extremes ? f.get(`mx${i}#${half}`) : f.f64x2(Number.NaN)));
        record('runningMin', i, (half) => (extremes ? f.get(`mn${i}#${half}`) : f.f64x2(Number.NaN)));
        record('absorptionTime', i, (half) =>
          absorbing[i] ? f.get(`abT${i}#${half}`) : f.f64x2(Number.NaN),
        );
      }
      for (let w = 0; w < W; w++) record('firstPassage', w, (half) => f.get(`fp${w}#${half}`));
      record('lossTime', 0, () => f.f64x2(Number.NaN));
      f.get('g').i32(1).op(OP.i32Add).set('g').br('groups');
    });
  });
  f.get('g');
  mod.define(runIndex, f);
  return { bytes: mod.encode(), callOuts, constants };
}
