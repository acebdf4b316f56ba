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
  COLD_OFFSET,
  FN_PAIRS_OFFSET,
  MASK_OFFSET,
  STATE_OFFSET,
  STATE_VECTORS,
  STEP_OFFSET,
  HEADER_FIELDS,
  HEADER_OFFSET,
  POOL_OFFSET,
  POOL_SIZE,
  TABLE_OFFSET,
  type HeaderField,
} from './memory-layout';
import { parseAssignments, namesRead, Unsupported, type Assignment } from './source-tree';
import { PORTED_FUNCTIONS } from './fdlibm';
import { declareSlowNormalLocals, emitSlowNormal, next } from './ziggurat-wasm';

/**
 * The wasm kernel of a plan: `run(g0, g1)` simulates path groups g0 … g1 − 1 (four paths per
 * group, p = 4g … 4g + 3 of the chunk) and returns the group it reached (g1 unless a long path
 * was stopped). Paths are simulated four at a time: xoshiro128** on i32x4 (one stream per lane,
 * seeded by the caller exactly as the JavaScript kernel seeds a path), the ziggurat's fast test
 * for four lanes with the table read per lane, and the state as two f64x2 halves per variable.
 * When any lane needs the ziggurat's rare branch the hot loop is left, that draw is finished lane
 * by lane (the rare branch is the engine's own JavaScript `normalSlowPath` on the lane's state),
 * and the step completes outside the loop, as in codegen.ts. A lane that is lost (not a number,
 * infinite, beyond the bound) has its records written at that step and is masked out after.
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
    'wn',
    'kn',
  ];
  const declareLocals = (): void => {
    declareSlowNormalLocals(f);
    for (const name of ['g', 'p', 'n', 'k', 'q', 'j', 'end', 'nextSave', 'nextProbe', 'slow', 'hz', 'a'])
      f.local(name, I32);
    for (const field of HEADER_FIELDS) f.local(`base_${field}`, I32);
    for (let lane = 0; lane < 4; lane++) f.local(`iz${lane}`, I32);
    for (const name of ['tEnd', 'rfs', 'zs']) f.local(name, F64);
    for (const name of ['x0', 'x1', 'x2', 'x3', 'r', 'xt', 'rfLo', 'rfHi', 'blownAny', 'rfs2', 'rfs3'])
      f.local(name, V128);
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

  // --- xoshiro128** on four lanes (xoshiro128.ts XOSHIRO_NEXT_SOURCE) ---
  const rotl = (name: string, bits: number): void => {
    f.get(name)
      .i32(bits)
      .simd(SIMD.i32x4Shl)
      .get(name)
      .i32(32 - bits)
      .simd(SIMD.i32x4ShrU);
    f.simd(SIMD.v128Or);
  };
  /** v·(2^shift + 1) mod 2^32 per lane, as the shift and add it is (the same bits as Math.imul). */
  const timesPowerPlusOne = (name: string, shift: number): void => {
    f.get(name).i32(shift).simd(SIMD.i32x4Shl).get(name).simd(SIMD.i32x4Add);
  };
  const xoshiro = (): void => {
    timesPowerPlusOne('x1', 2);
    f.set('r');
    rotl('r', 7);
    f.set('r');
    timesPowerPlusOne('r', 3);
    f.set('r');
    f.get('x1').i32(9).simd(SIMD.i32x4Shl).set('xt');
    f.get('x2').get('x0').simd(SIMD.v128Xor).set('x2');
    f.get('x3').get('x1').simd(SIMD.v128Xor).set('x3');
    f.get('x1').get('x2').simd(SIMD.v128Xor).set('x1');
    f.get('x0').get('x3').simd(SIMD.v128Xor).set('x0');
    f.get('x2').get('xt').simd(SIMD.v128Xor).set('x2');
    rotl('x3', 11);
    f.set('x3');
  };
  /** iz per lane (as byte offsets 16·iz) and rf as two f64x2 halves, from r. */
  const drawPrelude = (): void => {
    f.get('r').i32(0).v128Load(MASK_OFFSET).simd(SIMD.v128And);
    f.i32(4).simd(SIMD.i32x4Shl).set('xt');
    for (let lane = 0; lane < 4; lane++) f.get('xt').lane(SIMD.i32x4ExtractLane, lane).set(`iz${lane}`);
    f.get('r').simd(SIMD.f64x2ConvertLowI32x4S).set('rfLo');
    f.get('r').get('r').shuffle([8, 9, 10, 11, 12, 13, 14, 15, 8, 9, 10, 11, 12, 13, 14, 15]);
    f.simd(SIMD.f64x2ConvertLowI32x4S).set('rfHi');
  };
  /** (wn, kn²) of lanes `first` and `first + 1`, as the vectors wn#half and kn#half. */
  const tablePair = (first: number): void => {
    const half = first >> 1;
    f.get(`iz${first}`).v128Load(TABLE_OFFSET).set('rfs2');
    f.get(`iz${first + 1}`)
      .v128Load(TABLE_OFFSET)
      .set('rfs3');
    f.get('rfs2').get('rfs3').shuffle([0, 1, 2, 3, 4, 5, 6, 7, 16, 17, 18, 19, 20, 21, 22, 23]);
    f.set(`wn#${half}`);
    f.get('rfs2').get('rfs3').shuffle([8, 9, 10, 11, 12, 13, 14, 15, 24, 25, 26, 27, 28, 29, 30, 31]);
    f.set(`kn#${half}`);
  };
  /** The fast draw for all four lanes into z{j}; leaves the loop to `rare` when any lane fails. */
  /**
   * The draw for all four lanes into z{j}: the fast test on four lanes; when any lane fails, the
   * draw is finished lane by lane (cold, no call): the fast path where it passes, the rare branch
   * in wasm (ziggurat-wasm.ts) on that lane's generator state where it fails.
   */
  const draw = (j: number): void => {
    xoshiro();
    drawPrelude();
    tablePair(0);
    tablePair(2);
    f.get('rfLo').get('wn#0').simd(SIMD.f64x2Mul).set(`z${j}#0`);
    f.get('rfHi').get('wn#1').simd(SIMD.f64x2Mul).set(`z${j}#1`);
    f.get('rfLo').get('rfLo').simd(SIMD.f64x2Mul).get('kn#0').simd(SIMD.f64x2Ge).simd(SIMD.i64x2Bitmask);
    f.get('rfHi').get('rfHi').simd(SIMD.f64x2Mul).get('kn#1').simd(SIMD.f64x2Ge).simd(SIMD.i64x2Bitmask);
    f.i32(2).op(OP.i32Shl).op(OP.i32Or).tee('slow');
    f.if(() => coldDraw(j));
  };
  /** Lanes whose fast test failed (bits of `slow`) finish their draw in wasm, one by one. */
  /**
   * exp(y) on two lanes for y in (−6.2, 0] (the ziggurat's wedge test, −x²/2 with |x| ≤ r): the
   * branches of fdlibm.ts that this range can take, as selects; ldexp is exact here (a normal
   * result), so it is a multiplication by 2^k.
   */
  const wedgeExp = (y: string): void => {
    const v = (name: string): string => f.local(`we_${name}`, V128);
    f.f64x2(1.442695040888963387).get(y).simd(SIMD.f64x2Mul).f64x2(0.5).simd(SIMD.f64x2Sub);
    f.simd(SIMD.f64x2Trunc).set(v('k'));
    f.get(y).get(v('k')).f64x2(6.9314718036912381649e-1).simd(SIMD.f64x2Mul).simd(SIMD.f64x2Sub).set(v('hi'));
    f.get(v('k')).f64x2(1.90821492927058770002e-10).simd(SIMD.f64x2Mul).set(v('lo'));
    f.get(v('hi')).get(v('lo')).simd(SIMD.f64x2Sub).set(v('r'));
    f.get(v('r')).get(v('r')).simd(SIMD.f64x2Mul).set(v('t'));
    const p = [
      0.16666666666666602, -0.0027777777777015593, 0.00006613756321437934, -0.0000016533902205465252,
      4.1381367970572385e-8,
    ];
    f.f64x2(p[4]!);
    for (let i = 3; i >= 0; i--) {
      f.set(v('p')).f64x2(p[i]!).get(v('t')).get(v('p')).simd(SIMD.f64x2Mul).simd(SIMD.f64x2Add);
    }
    f.set(v('p'));
    f.get(v('r')).get(v('t')).get(v('p')).simd(SIMD.f64x2Mul).simd(SIMD.f64x2Sub).set(v('c'));
    f.f64x2(1).get(v('lo')).get(v('r')).get(v('c')).simd(SIMD.f64x2Mul);
    f.f64x2(2).get(v('c')).simd(SIMD.f64x2Sub).simd(SIMD.f64x2Div).simd(SIMD.f64x2Sub);
    f.get(v('hi')).simd(SIMD.f64x2Sub).simd(SIMD.f64x2Sub);
    // · 2^k, built from k's bits
    f.get(v('k')).simd(SIMD.i32x4TruncSatF64x2SZero).simd(SIMD.i64x2ExtendLowI32x4S);
    f.i64(1023n).simd(SIMD.i64x2Splat).simd(SIMD.i64x2Add).i32(52).simd(SIMD.i64x2Shl);
    f.simd(SIMD.f64x2Mul).set(v('res'));
    // |y| < 2^-28: 1 + y
    f.f64x2(1).get(y).simd(SIMD.f64x2Add).get(v('res'));
    f.get(y)
      .f64x2(-(2 ** -28))
      .simd(SIMD.f64x2Gt)
      .get(y)
      .f64x2(2 ** -28)
      .simd(SIMD.f64x2Lt)
      .simd(SIMD.v128And);
    f.simd(SIMD.v128Bitselect);
  };
  /**
   * The wedge test of Marsaglia & Tsang on every lane that failed the fast test outside the base
   * layer, as normalSlowPath's first round does it: one uniform from that lane's generator (the
   * others keep theirs), fn[iz] + u·(fn[iz − 1] − fn[iz]) < exp(−x²/2). Accepted lanes keep
   * z = x; the others are finished lane by lane.
   */
  const vectorWedge = (j: number): void => {
    f.local('tail', I32);
    f.local('wedge', I32);
    for (const name of ['ox0', 'ox1', 'ox2', 'ox3', 'rOrig', 'wy', 'wfnI', 'wfnM', 'wu']) f.local(name, V128);
    f.i32(0);
    for (let lane = 0; lane < 4; lane++)
      f.get(`iz${lane}`).op(OP.i32Eqz).i32(lane).op(OP.i32Shl).op(OP.i32Or);
    f.get('slow').op(OP.i32And).set('tail');
    f.get('slow').get('tail').op(OP.i32Xor).tee('wedge');
    f.if(() => {
      f.get('r').set('rOrig');
      for (let w = 0; w < 4; w++) f.get(`x${w}`).set(`ox${w}`);
      xoshiro();
      f.get('wedge').simd(SIMD.i32x4Splat).v128([1, 0, 0, 0, 2, 0, 0, 0, 4, 0, 0, 0, 8, 0, 0, 0]);
      f.simd(SIMD.v128And).v128([0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]).simd(SIMD.i32x4Eq);
      f.set('xt');
      // Lanes outside the wedge keep their generator (xt is their mask).
      for (let w = 0; w < 4; w++)
        f.get(`ox${w}`).get(`x${w}`).get('xt').simd(SIMD.v128Bitselect).set(`x${w}`);
      f.i32(0).set('slow');
      for (const half of HALVES) {
        // u = ((r >>> 0) + 0.5)·2^-32
        f.get('r');
        if (half) f.get('r').shuffle([8, 9, 10, 11, 12, 13, 14, 15, 8, 9, 10, 11, 12, 13, 14, 15]);
        f.simd(SIMD.f64x2ConvertLowI32x4U).f64x2(0.5).simd(SIMD.f64x2Add);
        f.f64x2(2.3283064365386963e-10).simd(SIMD.f64x2Mul).set('wu');
        f.get(`iz${2 * half}`)
          .v128Load(FN_PAIRS_OFFSET)
          .set('rfs2');
        f.get(`iz${2 * half + 1}`)
          .v128Load(FN_PAIRS_OFFSET)
          .set('rfs3');
        f.get('rfs2')
          .get('rfs3')
          .shuffle([0, 1, 2, 3, 4, 5, 6, 7, 16, 17, 18, 19, 20, 21, 22, 23])
          .set('wfnI');
        f.get('rfs2')
          .get('rfs3')
          .shuffle([8, 9, 10, 11, 12, 13, 14, 15, 24, 25, 26, 27, 28, 29, 30, 31])
          .set('wfnM');
        // fn[iz] + u·(fn[iz − 1] − fn[iz])
        f.get('wfnI').get('wu').get('wfnM').get('wfnI').simd(SIMD.f64x2Sub).simd(SIMD.f64x2Mul);
        f.simd(SIMD.f64x2Add).set('wfnI');
        f.f64x2(-0.5)
          .get(`z${j}#${half}`)
          .simd(SIMD.f64x2Mul)
          .get(`z${j}#${half}`)
          .simd(SIMD.f64x2Mul)
          .set('wy');
        f.get('wfnI');
        wedgeExp('wy');
        f.simd(SIMD.f64x2Lt).simd(SIMD.i64x2Bitmask);
        if (half) f.i32(2).op(OP.i32Shl);
        f.get('slow').op(OP.i32Or).set('slow');
      }
      // Remaining: wedge lanes not accepted, and the base-layer lanes.
      f.get('wedge')
        .get('slow')
        .op(OP.i32And)
        .get('wedge')
        .op(OP.i32Xor)
        .get('tail')
        .op(OP.i32Or)
        .set('slow');
      f.get('rOrig').set('r');
    });
    f.get('slow').op(OP.i32Eqz);
    f.if(() => f.br('drawn'));
  };
  const coldDraw = (j: number): void => {
    f.block('drawn', () => {
      vectorWedge(j);
      f.loop('lanes', () => {
        // The lowest lane still to finish; clear its bit.
        f.get('slow').op(OP.i32Ctz).set('a');
        f.get('slow').get('slow').i32(1).op(OP.i32Sub).op(OP.i32And).set('slow');
        // Out of the lane through memory (a narrow load of a wide store forwards well).
        ['x0', 'x1', 'x2', 'x3', 'r'].forEach((x, w) =>
          f
            .i32(0)
            .get(x)
            .v128Store(COLD_OFFSET + 16 * w),
        );
        f.get('a').i32(4).op(OP.i32Mul).set('j');
        for (let w = 0; w < 4; w++)
          f.get('j')
            .load(OP.i32Load, 2, COLD_OFFSET + 16 * w)
            .set(`zg${w}`);
        f.block('laneDone', () => {
          f.get('tail').get('a').op(OP.i32ShrU).i32(1).op(OP.i32And);
          f.if(
            // A base-layer lane: the rare branch from its first draw.
            () =>
              f
                .get('j')
                .load(OP.i32Load, 2, COLD_OFFSET + 64)
                .set('zhz'),
            // A lane whose wedge test failed: the next draw, fast test first (normalSlowPath's loop).
            () => {
              next(f);
              f.get('zr').set('zhz');
            },
          );
          f.get('zhz').i32(127).op(OP.i32And).set('ziz');
          f.get('tail').get('a').op(OP.i32ShrU).i32(1).op(OP.i32And).op(OP.i32Eqz);
          f.if(() => {
            f.get('zhz').op(OP.f64ConvertI32S).set('rfs');
            f.get('rfs').get('rfs').op(OP.f64Mul);
            f.get('ziz')
              .i32(16)
              .op(OP.i32Mul)
              .load(OP.f64Load, 3, TABLE_OFFSET + 8);
            f.op(OP.f64Lt);
            f.if(() => {
              f.get('rfs');
              f.get('ziz').i32(16).op(OP.i32Mul).load(OP.f64Load, 3, TABLE_OFFSET);
              f.op(OP.f64Mul).set('zout').br('laneDone');
            });
          });
          emitSlowNormal(f);
        });
        // Back into lane `a` without a branch: a mask of that lane, then bitselect (a wide reload
        // of narrow stores would stall store forwarding instead).
        f.get('a').simd(SIMD.i32x4Splat).v128([0, 0, 0, 0, 1, 0, 0, 0, 2, 0, 0, 0, 3, 0, 0, 0]);
        f.simd(SIMD.i32x4Eq).set('xt');
        for (let w = 0; w < 4; w++) {
          f.get(`zg${w}`).simd(SIMD.i32x4Splat).get(`x${w}`).get('xt').simd(SIMD.v128Bitselect).set(`x${w}`);
        }
        for (const half of HALVES) {
          const z = `z${j}#${half}`;
          f.get('a').op(OP.i64ExtendI32U).simd(SIMD.i64x2Splat);
          f.v128([2 * half, 0, 0, 0, 0, 0, 0, 0, 2 * half + 1, 0, 0, 0, 0, 0, 0, 0])
            .simd(SIMD.i64x2Eq)
            .set('rfs2');
          f.get('zout').simd(SIMD.f64x2Splat).get(z).get('rfs2').simd(SIMD.v128Bitselect).set(z);
        }
        f.get('slow').brIf('lanes');
      });
    });
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
    ].flatMap((name) => HALVES.map((half) => `${name}#${half}`)),
  ];
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

  // --- the hot loop: hot(n, end, p) steps group p from step n to `end` with no call at all (so
  // the register allocator keeps the generator and the states in registers), and returns −1 at
  // `end`, −2 when every lane was lost, or the draw j whose fast test failed in some lane (the
  // run function finishes that step). The step reached is left at STEP_OFFSET.
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
            for (let j = 0; j < m; j++) draw(j);
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
  declareLocals();
  emitHot();
  mod.define(hotIndex, hotBody);
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
      ['x0', 'x1', 'x2', 'x3'].forEach((x, w) => {
        f.get('g').i32(64).op(OP.i32Mul);
        base('seeds');
        f.op(OP.i32Add)
          .v128Load(16 * w)
          .set(x);
      });
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
      storeState();
      f.block('path', () => {
        f.loop('calls', () => {
          f.call(hotIndex).set('slow');
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
