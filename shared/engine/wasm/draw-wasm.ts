import type { FunctionBody } from './emitter';
import { I32, OP, SIMD, V128 } from './opcodes';
import { emitWedgeExpX2 } from './fdlibm';
import {
  FINISH_OFFSET,
  FIRST_OUTPUT_OFFSET,
  FN_PAIRS_OFFSET,
  MASK_OFFSET,
  TABLE_OFFSET,
  WEDGE_OFFSET,
} from './memory-layout';

/**
 * The normal draws of the wasm kernel's hot loop, four lanes at a time: xoshiro128** on i32x4 (one
 * stream per lane), the ziggurat's fast test, and, when a lane fails it, the rest of
 * `normalSlowPath` (random/ziggurat.ts) on four lanes: the wedge test and the next output with its
 * fast test, round after round, each lane drawing from its own stream only. A lane that reaches the
 * base layer's tail (about 0.06 % of draws) is left to the finisher (finishLanes in
 * ziggurat-wasm.ts): the hot loop stops, the run function finishes those lanes, and the loop
 * resumes after that draw. Every lane gives the bits the JavaScript kernel gives.
 *
 * Measured on the OU bench case (10,000 paths, 1,000 steps): 10.6 % of groups fail some lane's fast
 * test and 5 % need a second round; finishing those rounds lane by lane, in the loop or through a
 * call, cost as much as the rest of the kernel, because its registers pushed the loop's own
 * vectors out to the stack.
 */

const UPPER_HALF = [8, 9, 10, 11, 12, 13, 14, 15, 8, 9, 10, 11, 12, 13, 14, 15];
const LOW_LANES = [0, 1, 2, 3, 4, 5, 6, 7, 16, 17, 18, 19, 20, 21, 22, 23];
const HIGH_LANES = [8, 9, 10, 11, 12, 13, 14, 15, 24, 25, 26, 27, 28, 29, 30, 31];
const LANE_BITS = [1, 0, 0, 0, 2, 0, 0, 0, 4, 0, 0, 0, 8, 0, 0, 0];
/** i32 lane masks to the f64 lanes of each half (lanes 0, 1 and lanes 2, 3). */
const HALF_MASKS = [
  [0, 1, 2, 3, 0, 1, 2, 3, 4, 5, 6, 7, 4, 5, 6, 7],
  [8, 9, 10, 11, 8, 9, 10, 11, 12, 13, 14, 15, 12, 13, 14, 15],
];
const GENERATOR = ['x0', 'x1', 'x2', 'x3'];
const HALVES = [0, 1] as const;

export interface DrawTarget {
  /** The byte address where the hot loop keeps draw j's two f64x2 when it stops (for the finisher). */
  drawAddress(j: number): number;
  /** Stops the hot loop with the finisher's code. */
  leaveForFinisher(): void;
}

/** Declares the locals the draws use (besides z{j}#half, which the kernel declares). */
export function declareDrawLocals(f: FunctionBody): void {
  for (const name of ['slow', 'tail', 'wedge', 'rejected', 'unsure', 'finish']) f.local(name, I32);
  for (let lane = 0; lane < 4; lane++) f.local(`iz${lane}`, I32);
  for (const name of [...GENERATOR, 'r', 'xt', 'rfLo', 'rfHi', 'rfs2', 'rfs3', 'laneMask'])
    f.local(name, V128);
  for (const name of [...GENERATOR.map((x) => `o${x}`), 'or', 'oz0', 'oz1', 'wu', 'wy', 'wfnI', 'wfnM'])
    f.local(name, V128);
  for (const name of ['wA#0', 'wA#1', 'wc3', 'wc2', 'wc1', 'wc0', 'wym', 'wband', 'wd']) f.local(name, V128);
  for (const name of ['wn', 'kn']) for (const half of HALVES) f.local(`${name}#${half}`, V128);
}

export class DrawEmitter {
  constructor(
    private readonly f: FunctionBody,
    private readonly target: DrawTarget,
  ) {}

  /** The draw j for all four lanes into z{j}#0 and z{j}#1. */
  draw(j: number): void {
    const f = this.f;
    this.fastDraw(j);
    f.tee('slow');
    f.if(() => this.rareRounds(j));
  }

  // --- xoshiro128** on four lanes (xoshiro128.ts XOSHIRO_NEXT_SOURCE) ---
  private rotl(name: string, bits: number): void {
    this.f
      .get(name)
      .i32(bits)
      .simd(SIMD.i32x4Shl)
      .get(name)
      .i32(32 - bits)
      .simd(SIMD.i32x4ShrU)
      .simd(SIMD.v128Or);
  }
  /** v·(2^shift + 1) mod 2^32 per lane, as the shift and add it is (the same bits as Math.imul). */
  private timesPowerPlusOne(name: string, shift: number): void {
    this.f.get(name).i32(shift).simd(SIMD.i32x4Shl).get(name).simd(SIMD.i32x4Add);
  }
  /** The next output of every lane's generator into r. */
  private xoshiro(): void {
    const f = this.f;
    this.timesPowerPlusOne('x1', 2);
    f.set('r');
    this.rotl('r', 7);
    f.set('r');
    this.timesPowerPlusOne('r', 3);
    f.set('r');
    f.get('x1').i32(9).simd(SIMD.i32x4Shl).set('xt');
    f.get('x2').get('x0').simd(SIMD.v128Xor).set('x2');
    f.get('x3').get('x1').simd(SIMD.v128Xor).set('x3');
    f.get('x1').get('x2').simd(SIMD.v128Xor).set('x1');
    f.get('x0').get('x3').simd(SIMD.v128Xor).set('x0');
    f.get('x2').get('xt').simd(SIMD.v128Xor).set('x2');
    this.rotl('x3', 11);
    f.set('x3');
  }

  /**
   * The fast test on r's four lanes: iz per lane (as byte offsets 16·iz), z{j} = r·wn[iz] and the
   * bits of the lanes that fail |r| < kn[iz] (as r² < kn², one table read per lane) on the stack.
   */
  private fastDraw(j: number): void {
    const f = this.f;
    this.xoshiro();
    f.get('r').i32(0).v128Load(MASK_OFFSET).simd(SIMD.v128And);
    f.i32(4).simd(SIMD.i32x4Shl).set('xt');
    for (let lane = 0; lane < 4; lane++) f.get('xt').lane(SIMD.i32x4ExtractLane, lane).set(`iz${lane}`);
    f.get('r').simd(SIMD.f64x2ConvertLowI32x4S).set('rfLo');
    f.get('r').get('r').shuffle(UPPER_HALF);
    f.simd(SIMD.f64x2ConvertLowI32x4S).set('rfHi');
    for (const half of HALVES) {
      // (wn, kn²) of lanes 2·half and 2·half + 1, as the vectors wn#half and kn#half.
      f.get(`iz${2 * half}`)
        .v128Load(TABLE_OFFSET)
        .set('rfs2');
      f.get(`iz${2 * half + 1}`)
        .v128Load(TABLE_OFFSET)
        .set('rfs3');
      f.get('rfs2').get('rfs3').shuffle(LOW_LANES).set(`wn#${half}`);
      f.get('rfs2').get('rfs3').shuffle(HIGH_LANES).set(`kn#${half}`);
    }
    f.get('rfLo').get('wn#0').simd(SIMD.f64x2Mul).set(`z${j}#0`);
    f.get('rfHi').get('wn#1').simd(SIMD.f64x2Mul).set(`z${j}#1`);
    f.get('rfLo').get('rfLo').simd(SIMD.f64x2Mul).get('kn#0').simd(SIMD.f64x2Ge).simd(SIMD.i64x2Bitmask);
    f.get('rfHi').get('rfHi').simd(SIMD.f64x2Mul).get('kn#1').simd(SIMD.f64x2Ge).simd(SIMD.i64x2Bitmask);
    f.i32(2).op(OP.i32Shl).op(OP.i32Or);
  }

  /** laneMask = all ones in the i32 lanes whose bits are set in `bits`. */
  private laneMask(bits: string): void {
    this.f.get(bits).simd(SIMD.i32x4Splat).v128(LANE_BITS).simd(SIMD.v128And);
    this.f.v128(LANE_BITS).simd(SIMD.i32x4Eq).set('laneMask');
  }
  /** The laneMask as a mask of a half's two f64 lanes. */
  private halfMask(half: number): void {
    this.f.get('laneMask').get('laneMask').shuffle(HALF_MASKS[half]!);
  }
  /** Keeps the generator of the lanes outside laneMask as it was (in ox0 … ox3). */
  private keepOtherGenerators(): void {
    for (const x of GENERATOR) this.f.get(x).get(`o${x}`).get('laneMask').simd(SIMD.v128Bitselect).set(x);
  }

  /**
   * The wedge test of Marsaglia & Tsang on the lanes in `wedge`, as normalSlowPath does it: one
   * uniform from each of those lanes' generators (the others keep theirs),
   * fn[iz] + u·(fn[iz − 1] − fn[iz]) < exp(−x²/2) with x = z{j}, decided by the layer's cubic and
   * band (wedge-table.ts) and by exp only for lanes inside the band. The bits of the lanes that
   * fail it go to `rejected`; r is left as it was.
   */
  private wedgeTest(j: number): void {
    const f = this.f;
    f.get('r').set('or');
    for (const x of GENERATOR) f.get(x).set(`o${x}`);
    this.xoshiro();
    this.laneMask('wedge');
    this.keepOtherGenerators();
    f.i32(0).set('rejected');
    f.i32(0).set('unsure');
    /** The two lanes' f64 at `offset` of their layer rows (iz·`scale` bytes apart) as one f64x2, and the next f64 as another. */
    const pairs = (offset: number, shift: number, half: number, low: string, high: string): void => {
      for (const [lane, into] of [
        [2 * half, 'rfs2'],
        [2 * half + 1, 'rfs3'],
      ] as const) {
        f.get(`iz${lane}`);
        if (shift > 0) f.i32(shift).op(OP.i32Shl);
        f.v128Load(offset).set(into);
      }
      f.get('rfs2').get('rfs3').shuffle(LOW_LANES).set(low);
      f.get('rfs2').get('rfs3').shuffle(HIGH_LANES).set(high);
    };
    for (const half of HALVES) {
      // A = fn[iz] + u·(fn[iz − 1] − fn[iz]), u = ((r >>> 0) + 0.5)·2^-32
      f.get('r');
      if (half) f.get('r').shuffle(UPPER_HALF);
      f.simd(SIMD.f64x2ConvertLowI32x4U).f64x2(0.5).simd(SIMD.f64x2Add);
      f.f64x2(2.3283064365386963e-10).simd(SIMD.f64x2Mul).set('wu');
      pairs(FN_PAIRS_OFFSET, 0, half, 'wfnI', 'wfnM');
      f.get('wfnI').get('wu').get('wfnM').get('wfnI').simd(SIMD.f64x2Sub).simd(SIMD.f64x2Mul);
      f.simd(SIMD.f64x2Add).set(`wA#${half}`);
      // P = ((c3·d + c2)·d + c1)·d + c0, d = x·x − ym (wedgeCubic's order)
      pairs(WEDGE_OFFSET, 2, half, 'wc3', 'wc2');
      pairs(WEDGE_OFFSET + 16, 2, half, 'wc1', 'wc0');
      pairs(WEDGE_OFFSET + 32, 2, half, 'wym', 'wband');
      const z = `z${j}#${half}`;
      f.get(z).get(z).simd(SIMD.f64x2Mul).get('wym').simd(SIMD.f64x2Sub).set('wd');
      f.get('wc3').get('wd').simd(SIMD.f64x2Mul).get('wc2').simd(SIMD.f64x2Add);
      f.get('wd').simd(SIMD.f64x2Mul).get('wc1').simd(SIMD.f64x2Add);
      f.get('wd').simd(SIMD.f64x2Mul).get('wc0').simd(SIMD.f64x2Add).set('wd');
      // Surely rejected: A ≥ P + band; surely accepted: A < P − band; else unsure.
      f.get(`wA#${half}`).get('wd').get('wband').simd(SIMD.f64x2Add).simd(SIMD.f64x2Ge).set('wc3');
      f.get(`wA#${half}`).get('wd').get('wband').simd(SIMD.f64x2Sub).simd(SIMD.f64x2Lt).set('wc2');
      f.get('wc3').simd(SIMD.i64x2Bitmask);
      if (half) f.i32(2).op(OP.i32Shl);
      f.get('rejected').op(OP.i32Or).set('rejected');
      f.get('wc3').get('wc2').simd(SIMD.v128Or).simd(SIMD.v128Not).simd(SIMD.i64x2Bitmask);
      if (half) f.i32(2).op(OP.i32Shl);
      f.get('unsure').op(OP.i32Or).set('unsure');
    }
    f.get('rejected').get('wedge').op(OP.i32And).set('rejected');
    f.get('unsure').get('wedge').op(OP.i32And);
    f.if(() => {
      // Rare: some lane inside its band. The exact test, as the JavaScript kernel makes it.
      f.i32(0).set('rejected');
      for (const half of HALVES) {
        const z = `z${j}#${half}`;
        f.f64x2(-0.5).get(z).simd(SIMD.f64x2Mul).get(z).simd(SIMD.f64x2Mul).set('wy');
        f.get(`wA#${half}`);
        emitWedgeExpX2(f, 'wy');
        // Not below: rejected (a NaN cannot occur here: both sides are finite).
        f.simd(SIMD.f64x2Ge).simd(SIMD.i64x2Bitmask);
        if (half) f.i32(2).op(OP.i32Shl);
        f.get('rejected').op(OP.i32Or).set('rejected');
      }
      f.get('rejected').get('wedge').op(OP.i32And).set('rejected');
    });
    f.get('or').set('r');
  }

  /**
   * The lanes in `rejected` take their next output, fast test first; the others keep their
   * generator, output and draw. Leaves the bits of the rejected lanes that fail again in `slow`.
   */
  private redraw(j: number): void {
    const f = this.f;
    f.get('r').set('or');
    for (const x of GENERATOR) f.get(x).set(`o${x}`);
    for (const half of HALVES) f.get(`z${j}#${half}`).set(`oz${half}`);
    this.fastDraw(j);
    f.get('rejected').op(OP.i32And).set('slow');
    this.laneMask('rejected');
    this.keepOtherGenerators();
    f.get('r').get('or').get('laneMask').simd(SIMD.v128Bitselect).set('r');
    for (const half of HALVES) {
      f.get(`z${j}#${half}`).get(`oz${half}`);
      this.halfMask(half);
      f.simd(SIMD.v128Bitselect).set(`z${j}#${half}`);
    }
  }

  /**
   * normalSlowPath's rounds on the lanes in `slow` (their fast test failed): a lane in the base
   * layer goes to the finisher with its output r; the others take the wedge test, and those
   * rejected take their next output, until every lane has its draw or waits for the finisher.
   */
  private rareRounds(j: number): void {
    const f = this.f;
    f.i32(0).set('finish');
    f.block('rounds', () => {
      f.loop('round', () => {
        // The lanes whose layer (r & 127) is the base layer 0.
        f.get('r').i32(0).v128Load(MASK_OFFSET).simd(SIMD.v128And);
        f.v128(new Array<number>(16).fill(0)).simd(SIMD.i32x4Eq).simd(SIMD.i32x4Bitmask);
        f.get('slow').op(OP.i32And).tee('tail');
        f.get('finish').op(OP.i32Or).set('finish');
        f.get('slow').get('tail').op(OP.i32Xor).tee('wedge');
        f.op(OP.i32Eqz).brIf('rounds');
        this.wedgeTest(j);
        // No branch on `rejected`: about half of the wedge tests reject, so a branch there would be
        // mispredicted half the time, late (after the exp). The redraw runs anyway, its generator
        // step and table reads alongside the exp, and keeps nothing for lanes not rejected.
        this.redraw(j);
        f.get('slow').brIf('round');
      });
    });
    f.get('finish');
    f.if(() => {
      // Rare: the base layer's tail. The finisher reads each lane's generator from the kept state
      // and its first output from FIRST_OUTPUT_OFFSET (r holds it: later rounds kept that lane's).
      f.i32(0).get('r').v128Store(FIRST_OUTPUT_OFFSET);
      f.i32(0).i32(j).store(OP.i32Store, 2, FINISH_OFFSET);
      f.i32(0)
        .get('finish')
        .store(OP.i32Store, 2, FINISH_OFFSET + 4);
      f.i32(0)
        .i32(this.target.drawAddress(j))
        .store(OP.i32Store, 2, FINISH_OFFSET + 8);
      this.target.leaveForFinisher();
    });
  }
}
