import type { FunctionBody } from './emitter';
import { F64, SIMD, V128 } from './opcodes';
import { Unsupported, type TestNode, type ValueNode } from './source-tree';
import { emitExp, emitLog, PORTED_FUNCTIONS } from './fdlibm';

/**
 * Emits a value tree on f64x2 vectors (two paths of a group of four per vector; `half` picks the
 * local `name#half`). Every operation gives the bits the JavaScript kernel gives:
 * + − × ÷, √, |x|, floor, ceil, min and max are the same IEEE-754 operations (wasm's f64x2.min
 * and max order −0 below +0 and return NaN for any NaN argument, as Math.min and Math.max do);
 * round, sign, step, pos and clamp are built from them; exp and log call the fdlibm ports in
 * this module (`ported`), and every other helper calls the engine's portable JavaScript
 * function lane by lane (`callOut`), so it is the same function.
 */
export interface LaneFunctions {
  /** Imported JavaScript functions by helper name and arity. */
  callOut(fn: string, arity: number): number;
  /** Emits an f64x2 constant (from the module's constant pool). */
  constant(value: number): void;
  /** Names that stand for constants (h, √h, …). */
  namedConstants: ReadonlyMap<string, number>;
}

/** Helpers with a direct instruction or a short branch-free sequence. */
const INLINE = new Set([
  'sqrt',
  'abs',
  'floor',
  'ceil',
  'min',
  'max',
  'pos',
  'clamp',
  'step',
  'sign',
  'round',
]);

/** Helpers whose JavaScript function may be called lane by lane (one import per arity used). */
export const CALLED_OUT = new Set([
  'exp',
  'log',
  'sin',
  'cos',
  'tan',
  'tanh',
  'sinh',
  'cosh',
  'atan',
  'atan2',
  'asin',
  'acos',
  'pow',
  'log10',
  'log1p',
  'expm1',
  'hypot',
]);

export class LaneEmitter {
  private scratch = 0;

  constructor(
    private readonly f: FunctionBody,
    private readonly functions: LaneFunctions,
  ) {}

  private temp(type: typeof V128 | typeof F64 = V128): string {
    return this.f.local(`tmp${this.scratch++}`, type);
  }

  /** Checks that a tree can be emitted, before any code is written. */
  static check(node: ValueNode | TestNode): void {
    switch (node.kind) {
      case 'call':
        if (!INLINE.has(node.fn) && !CALLED_OUT.has(node.fn))
          throw new Unsupported(`the function ${node.fn} is not in the wasm kernel`);
        node.args.forEach(LaneEmitter.check);
        return;
      case 'negate':
        LaneEmitter.check(node.operand);
        return;
      case 'arithmetic':
      case 'compare':
      case 'logic':
        LaneEmitter.check(node.left);
        LaneEmitter.check(node.right);
        return;
      case 'select':
        LaneEmitter.check(node.test);
        LaneEmitter.check(node.then);
        LaneEmitter.check(node.otherwise);
        return;
      case 'truthy':
        LaneEmitter.check(node.value);
        return;
      default:
        return;
    }
  }

  value(node: ValueNode, half: number): void {
    const f = this.f;
    switch (node.kind) {
      case 'number':
        this.functions.constant(node.value);
        return;
      case 'name': {
        const known = this.functions.namedConstants.get(node.name);
        if (known !== undefined) this.functions.constant(known);
        else f.get(`${node.name}#${half}`);
        return;
      }
      case 'negate':
        this.value(node.operand, half);
        f.simd(SIMD.f64x2Neg);
        return;
      case 'arithmetic':
        this.value(node.left, half);
        this.value(node.right, half);
        f.simd({ '+': SIMD.f64x2Add, '-': SIMD.f64x2Sub, '*': SIMD.f64x2Mul, '/': SIMD.f64x2Div }[node.op]);
        return;
      case 'select':
        // Both branches are pure, so evaluating both and selecting per lane is the same as `c ? a : b`.
        this.value(node.then, half);
        this.value(node.otherwise, half);
        this.test(node.test, half);
        f.simd(SIMD.v128Bitselect);
        return;
      case 'call':
        this.call(node.fn, node.args, half);
        return;
    }
  }

  /** Leaves a mask (all ones where true) for a condition, with JavaScript's truthiness of numbers. */
  test(node: TestNode, half: number): void {
    const f = this.f;
    switch (node.kind) {
      case 'compare':
        this.value(node.left, half);
        this.value(node.right, half);
        f.simd(
          {
            '<': SIMD.f64x2Lt,
            '<=': SIMD.f64x2Le,
            '>': SIMD.f64x2Gt,
            '>=': SIMD.f64x2Ge,
            '===': SIMD.f64x2Eq,
            '!==': SIMD.f64x2Ne,
          }[node.op],
        );
        return;
      case 'logic':
        this.test(node.left, half);
        this.test(node.right, half);
        f.simd(node.op === '&&' ? SIMD.v128And : SIMD.v128Or);
        return;
      case 'truthy': {
        // A number is true unless it is ±0 or NaN.
        const x = this.temp();
        this.value(node.value, half);
        f.tee(x).f64x2(0).simd(SIMD.f64x2Ne);
        f.get(x).get(x).simd(SIMD.f64x2Eq).simd(SIMD.v128And);
        return;
      }
    }
  }

  private args(args: ValueNode[], half: number): string[] {
    return args.map((arg) => {
      const x = this.temp();
      this.value(arg, half);
      this.f.set(x);
      return x;
    });
  }

  private call(fn: string, argNodes: ValueNode[], half: number): void {
    const f = this.f;
    const direct: Record<string, number> = {
      sqrt: SIMD.f64x2Sqrt,
      abs: SIMD.f64x2Abs,
      floor: SIMD.f64x2Floor,
      ceil: SIMD.f64x2Ceil,
    };
    if (direct[fn] !== undefined) {
      this.value(argNodes[0]!, half);
      f.simd(direct[fn]);
      return;
    }
    if (fn === 'min' || fn === 'max') {
      const op = fn === 'min' ? SIMD.f64x2Min : SIMD.f64x2Max;
      this.value(argNodes[0]!, half);
      for (const arg of argNodes.slice(1)) {
        this.value(arg, half);
        f.simd(op);
      }
      return;
    }
    if (fn === 'pos') {
      this.value(argNodes[0]!, half);
      f.f64x2(0).simd(SIMD.f64x2Max);
      return;
    }
    if (fn === 'clamp') {
      // Math.min(Math.max(x, lo), hi)
      this.value(argNodes[0]!, half);
      this.value(argNodes[1]!, half);
      f.simd(SIMD.f64x2Max);
      this.value(argNodes[2]!, half);
      f.simd(SIMD.f64x2Min);
      return;
    }
    const [x] = this.args(argNodes.slice(0, 1), half);
    if (fn === 'step') {
      // x >= 0 ? 1 : x < 0 ? 0 : NaN
      f.f64x2(1).f64x2(0).f64x2(Number.NaN);
      f.get(x!).f64x2(0).simd(SIMD.f64x2Lt).simd(SIMD.v128Bitselect);
      f.get(x!).f64x2(0).simd(SIMD.f64x2Ge).simd(SIMD.v128Bitselect);
      return;
    }
    if (fn === 'sign') {
      // Math.sign: 1 above 0, −1 below, else x itself (±0, NaN).
      f.f64x2(1).f64x2(-1).get(x!);
      f.get(x!).f64x2(0).simd(SIMD.f64x2Lt).simd(SIMD.v128Bitselect);
      f.get(x!).f64x2(0).simd(SIMD.f64x2Gt).simd(SIMD.v128Bitselect);
      return;
    }
    if (fn === 'round') {
      // Math.round: c = ceil(x); c − 0.5 > x ? c − 1 : c (exact: c − 0.5 and c − 1 are exact
      // below 2^52, and at or above it c = x).
      const c = this.temp();
      f.get(x!).simd(SIMD.f64x2Ceil).tee(c).f64x2(1).simd(SIMD.f64x2Sub);
      f.get(c);
      f.get(c).f64x2(0.5).simd(SIMD.f64x2Sub).get(x!).simd(SIMD.f64x2Gt).simd(SIMD.v128Bitselect);
      return;
    }
    const rest = this.args(argNodes.slice(1), half);
    const all = [x!, ...rest];
    if (PORTED_FUNCTIONS.has(fn)) {
      // Inline, lane by lane: no call in the hot loop.
      f.local('portIn', F64);
      f.local('portOut', F64);
      for (let lane = 0; lane < 2; lane++) {
        f.get(x!).lane(SIMD.f64x2ExtractLane, lane).set('portIn');
        (fn === 'exp' ? emitExp : emitLog)(f, 'portIn', 'portOut');
        if (lane === 0) f.get('portOut').simd(SIMD.f64x2Splat);
        else f.get('portOut').lane(SIMD.f64x2ReplaceLane, 1);
      }
      return;
    }
    const index = this.functions.callOut(fn, all.length);
    for (let lane = 0; lane < 2; lane++) {
      for (const a of all) f.get(a).lane(SIMD.f64x2ExtractLane, lane);
      f.call(index);
      if (lane === 0) f.simd(SIMD.f64x2Splat);
      else f.lane(SIMD.f64x2ReplaceLane, 1);
    }
  }
}
