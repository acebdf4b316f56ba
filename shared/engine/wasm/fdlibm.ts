import type { FunctionBody } from './emitter';
import { F64, I32, OP, SIMD, V128 } from './opcodes';

/**
 * Scalar wasm ports of the engine's `exp` and `log` (shared/expr/portable-math.ts: stdlib's ports
 * of FreeBSD msun's e_exp.c and e_log.c), emitted inline so the hot loop holds no call. Every
 * constant, branch and operation follows stdlib's JavaScript in the same order, so the results
 * are the same bits (tests/unit/engine/wasm/fdlibm.test.ts compares them on large samples).
 */

/** Helpers with a wasm port (the rest are called out to the engine's JavaScript functions). */
export const PORTED_FUNCTIONS: ReadonlySet<string> = new Set(['exp', 'log']);

const LN2_HI = 6.9314718036912381649e-1;
const LN2_LO = 1.90821492927058770002e-10;
const LOG2_E = 1.442695040888963387;
const OVERFLOW = 7.09782712893383973096e2;
const UNDERFLOW = -7.4513321910194110842e2;
const NEARZERO = 1 / (1 << 28);
const I64_BITS_32 = 32n;

function declare(f: FunctionBody, prefix: string, f64s: string[], i32s: string[]): void {
  for (const name of f64s) f.local(`${prefix}${name}`, F64);
  for (const name of i32s) f.local(`${prefix}${name}`, I32);
}

/** Horner form c0 + t·(c1 + t·(… + t·cn)), as stdlib's generated polyval files write it. */
function polyval(f: FunctionBody, t: string, coefficients: number[]): void {
  const last = coefficients.length - 1;
  f.f64(coefficients[last]!);
  for (let i = last - 1; i >= 0; i--) {
    // c_i + t·(inner): the inner value is on the stack.
    f.set('fd_poly').f64(coefficients[i]!).get(t).get('fd_poly').op(OP.f64Mul).op(OP.f64Add);
  }
}

/** out = exp(x) (stdlib math-base-special-exp with expmulti and ldexp). */
export function emitExp(f: FunctionBody, x: string, out: string): void {
  declare(f, 'fd_', ['hi', 'lo', 'r', 't', 'c', 'y', 'poly'], ['k', 'e']);
  f.block('exp', () => {
    const give = (emit: () => void): void => {
      emit();
      f.set(out).br('exp');
    };
    // NaN or +∞: x itself.
    f.get(x).get(x).op(OP.f64Ne).get(x).f64(Infinity).op(OP.f64Eq).op(OP.i32Or);
    f.if(() => give(() => f.get(x)));
    f.get(x).f64(-Infinity).op(OP.f64Eq);
    f.if(() => give(() => f.f64(0)));
    f.get(x).f64(OVERFLOW).op(OP.f64Gt);
    f.if(() => give(() => f.f64(Infinity)));
    f.get(x).f64(UNDERFLOW).op(OP.f64Lt);
    f.if(() => give(() => f.f64(0)));
    f.get(x).f64(-NEARZERO).op(OP.f64Gt).get(x).f64(NEARZERO).op(OP.f64Lt).op(OP.i32And);
    f.if(() => give(() => f.f64(1).get(x).op(OP.f64Add)));
    // k = trunc(LOG2_E·x ∓ 0.5)
    f.f64(LOG2_E).get(x).op(OP.f64Mul).set('fd_t');
    f.get(x).f64(0).op(OP.f64Lt);
    f.if(
      () => f.get('fd_t').f64(0.5).op(OP.f64Sub),
      () => f.get('fd_t').f64(0.5).op(OP.f64Add),
      F64,
    );
    f.op(OP.i32TruncF64S).set('fd_k');
    f.get(x).get('fd_k').op(OP.f64ConvertI32S).f64(LN2_HI).op(OP.f64Mul).op(OP.f64Sub).set('fd_hi');
    f.get('fd_k').op(OP.f64ConvertI32S).f64(LN2_LO).op(OP.f64Mul).set('fd_lo');
    // expmulti: r = hi − lo; t = r²; c = r − t·P(t); y = 1 − (lo − (r·c)/(2 − c) − hi)
    f.get('fd_hi').get('fd_lo').op(OP.f64Sub).set('fd_r');
    f.get('fd_r').get('fd_r').op(OP.f64Mul).set('fd_t');
    f.get('fd_r').get('fd_t');
    polyval(
      f,
      'fd_t',
      [
        0.16666666666666602, -0.0027777777777015593, 0.00006613756321437934, -0.0000016533902205465252,
        4.1381367970572385e-8,
      ],
    );
    f.op(OP.f64Mul).op(OP.f64Sub).set('fd_c');
    f.f64(1).get('fd_lo').get('fd_r').get('fd_c').op(OP.f64Mul);
    f.f64(2).get('fd_c').op(OP.f64Sub).op(OP.f64Div).op(OP.f64Sub);
    f.get('fd_hi').op(OP.f64Sub).op(OP.f64Sub).set('fd_y');
    // ldexp(y, k): y is a positive normal number here.
    f.get('fd_y').op(OP.i64ReinterpretF64).i64(52n).op(OP.i64ShrU).op(OP.i32WrapI64);
    f.i32(0x7ff).op(OP.i32And).i32(1023).op(OP.i32Sub).get('fd_k').op(OP.i32Add).set('fd_e');
    f.get('fd_e').i32(-1074).op(OP.i32LtS);
    f.if(() => give(() => f.f64(0)));
    f.get('fd_e').i32(1023).op(OP.i32GtS);
    f.if(() => give(() => f.f64(Infinity)));
    const withExponent = (): void => {
      f.get('fd_y')
        .op(OP.i64ReinterpretF64)
        .i64(~(0x7ffn << 52n))
        .op(OP.i64And);
      f.get('fd_e').i32(1023).op(OP.i32Add).op(OP.i64ExtendI32U).i64(52n).op(OP.i64Shl).op(OP.i64Or);
      f.op(OP.f64ReinterpretI64);
    };
    f.get('fd_e').i32(-1023).op(OP.i32LeS);
    f.if(
      () => {
        f.get('fd_e').i32(52).op(OP.i32Add).set('fd_e');
        f.f64(2.220446049250313e-16);
        withExponent();
        f.op(OP.f64Mul).set(out);
      },
      () => {
        withExponent();
        f.set(out);
      },
    );
  });
}

/** out = log(x) (stdlib math-base-special-ln). */
export function emitLog(f: FunctionBody, x: string, out: string): void {
  declare(f, 'fl_', ['x', 'f', 'R', 's', 'z', 'w', 't1', 't2', 'hfsq', 'kd'], ['hx', 'k', 'i', 'j']);
  f.local('fd_poly', F64);
  const highWord = (v: string): void => {
    f.get(v).op(OP.i64ReinterpretF64).i64(I64_BITS_32).op(OP.i64ShrU).op(OP.i32WrapI64);
  };
  f.block('log', () => {
    const give = (emit: () => void): void => {
      emit();
      f.set(out).br('log');
    };
    f.get(x).set('fl_x');
    f.get(x).f64(0).op(OP.f64Eq);
    f.if(() => give(() => f.f64(-Infinity)));
    f.get(x).get(x).op(OP.f64Ne).get(x).f64(0).op(OP.f64Lt).op(OP.i32Or);
    f.if(() => give(() => f.f64(Number.NaN)));
    highWord('fl_x');
    f.set('fl_hx').i32(0).set('fl_k');
    f.get('fl_hx').i32(0x00100000).op(OP.i32LtS);
    f.if(() => {
      f.i32(-54).set('fl_k');
      f.get('fl_x').f64(1.8014398509481984e16).op(OP.f64Mul).set('fl_x');
      highWord('fl_x');
      f.set('fl_hx');
    });
    f.get('fl_hx').i32(0x7ff00000).op(OP.i32GeS);
    f.if(() => give(() => f.get('fl_x').get('fl_x').op(OP.f64Add)));
    f.get('fl_k').get('fl_hx').i32(20).op(OP.i32ShrS).i32(1023).op(OP.i32Sub).op(OP.i32Add).set('fl_k');
    f.get('fl_hx').i32(0x000fffff).op(OP.i32And).set('fl_hx');
    f.get('fl_hx').i32(0x95f64).op(OP.i32Add).i32(0x100000).op(OP.i32And).set('fl_i');
    // x = setHighWord(x, hx | (i ^ 0x3ff00000))
    f.get('fl_x').op(OP.i64ReinterpretF64).i64(0xffffffffn).op(OP.i64And);
    f.get('fl_hx').get('fl_i').i32(0x3ff00000).op(OP.i32Xor).op(OP.i32Or);
    f.op(OP.i64ExtendI32U).i64(I64_BITS_32).op(OP.i64Shl).op(OP.i64Or).op(OP.f64ReinterpretI64).set('fl_x');
    f.get('fl_k').get('fl_i').i32(20).op(OP.i32ShrS).op(OP.i32Add).set('fl_k');
    f.get('fl_k').op(OP.f64ConvertI32S).set('fl_kd');
    f.get('fl_x').f64(1).op(OP.f64Sub).set('fl_f');
    const kIsZero = (): void => void f.get('fl_kd').f64(0).op(OP.f64Eq);
    const kHi = (): void => void f.get('fl_kd').f64(LN2_HI).op(OP.f64Mul);
    const kLo = (): void => void f.get('fl_kd').f64(LN2_LO).op(OP.f64Mul);
    f.i32(0x000fffff).get('fl_hx').i32(2).op(OP.i32Add).op(OP.i32And).i32(3).op(OP.i32LtS);
    f.if(() => {
      f.get('fl_f').f64(0).op(OP.f64Eq);
      f.if(() => {
        kIsZero();
        f.if(() => give(() => f.f64(0)));
        give(() => {
          kHi();
          kLo();
          f.op(OP.f64Add);
        });
      });
      // R = f·f·(0.5 − f/3)
      f.get('fl_f').get('fl_f').op(OP.f64Mul).f64(0.5).f64(0.3333333333333333).get('fl_f').op(OP.f64Mul);
      f.op(OP.f64Sub).op(OP.f64Mul).set('fl_R');
      kIsZero();
      f.if(() => give(() => f.get('fl_f').get('fl_R').op(OP.f64Sub)));
      give(() => {
        kHi();
        f.get('fl_R');
        kLo();
        f.op(OP.f64Sub).get('fl_f').op(OP.f64Sub).op(OP.f64Sub);
      });
    });
    f.get('fl_f').f64(2).get('fl_f').op(OP.f64Add).op(OP.f64Div).set('fl_s');
    f.get('fl_s').get('fl_s').op(OP.f64Mul).set('fl_z');
    f.get('fl_hx').i32(0x6147a).op(OP.i32Sub).set('fl_i');
    f.get('fl_z').get('fl_z').op(OP.f64Mul).set('fl_w');
    f.i32(0x6b851).get('fl_hx').op(OP.i32Sub).set('fl_j');
    f.get('fl_w');
    polyval(f, 'fl_w', [0.3999999999940942, 0.22222198432149784, 0.15313837699209373]);
    f.op(OP.f64Mul).set('fl_t1');
    f.get('fl_z');
    polyval(f, 'fl_w', [0.6666666666666735, 0.2857142874366239, 0.1818357216161805, 0.14798198605116586]);
    f.op(OP.f64Mul).set('fl_t2');
    f.get('fl_i').get('fl_j').op(OP.i32Or).set('fl_i');
    f.get('fl_t2').get('fl_t1').op(OP.f64Add).set('fl_R');
    f.get('fl_i').i32(0).op(OP.i32GtS);
    f.if(() => {
      f.f64(0.5).get('fl_f').op(OP.f64Mul).get('fl_f').op(OP.f64Mul).set('fl_hfsq');
      kIsZero();
      f.if(() =>
        give(() => {
          // f − (hfsq − s·(hfsq + R))
          f.get('fl_f').get('fl_hfsq').get('fl_s').get('fl_hfsq').get('fl_R').op(OP.f64Add).op(OP.f64Mul);
          f.op(OP.f64Sub).op(OP.f64Sub);
        }),
      );
      give(() => {
        // k·LN2_HI − ((hfsq − (s·(hfsq + R) + k·LN2_LO)) − f)
        kHi();
        f.get('fl_hfsq').get('fl_s').get('fl_hfsq').get('fl_R').op(OP.f64Add).op(OP.f64Mul);
        kLo();
        f.op(OP.f64Add).op(OP.f64Sub).get('fl_f').op(OP.f64Sub).op(OP.f64Sub);
      });
    });
    kIsZero();
    f.if(() =>
      give(() => {
        // f − s·(f − R)
        f.get('fl_f').get('fl_s').get('fl_f').get('fl_R').op(OP.f64Sub).op(OP.f64Mul).op(OP.f64Sub);
      }),
    );
    // k·LN2_HI − ((s·(f − R) − k·LN2_LO) − f)
    kHi();
    f.get('fl_s').get('fl_f').get('fl_R').op(OP.f64Sub).op(OP.f64Mul);
    kLo();
    f.op(OP.f64Sub).get('fl_f').op(OP.f64Sub).op(OP.f64Sub).set(out);
  });
}

/**
 * exp(y) on two lanes, left on the stack, for y in (−6.2, 0] (the ziggurat's wedge test, −x²/2
 * with |x| ≤ r): the branches of emitExp that this range can take, as selects; ldexp is exact
 * here (a normal result), so it is a multiplication by 2^k.
 */
export function emitWedgeExpX2(f: FunctionBody, y: string): void {
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
}
