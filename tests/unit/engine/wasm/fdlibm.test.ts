import { describe, expect, it } from 'vitest';
import { PORTABLE_MATH } from '@shared/expr/portable-math';
import { FunctionBody, ModuleBuilder } from '@shared/engine/wasm/emitter';
import { F64, I32, OP } from '@shared/engine/wasm/opcodes';
import { emitExp, emitLog } from '@shared/engine/wasm/fdlibm';
import { Xoshiro128 } from '@shared/engine/random/xoshiro128';

/**
 * The wasm ports of exp and log against the engine's JavaScript ones (stdlib's ports of FreeBSD
 * msun), bit for bit, on large samples per range with the special values; and against the
 * JavaScript engine's own Math.exp and Math.log within one unit in the last place (fdlibm's
 * documented error bound is below one ulp, e_exp.c and e_log.c).
 */

/** A module with `apply(count)`: out[i] = fn(in[i]) over f64 arrays at 0 and 8·count. */
function portModule(port: typeof emitExp): (inputs: Float64Array) => Float64Array {
  const mod = new ModuleBuilder();
  const index = mod.declareFunction([I32], [], 'apply');
  const f = new FunctionBody([['count', I32]], []);
  f.local('i', I32);
  f.local('x', F64);
  f.local('y', F64);
  f.block('done', () => {
    f.loop('each', () => {
      f.get('i').get('count').op(OP.i32GeS).brIf('done');
      f.get('i').i32(8).op(OP.i32Mul).load(OP.f64Load, 3).set('x');
      port(f, 'x', 'y');
      f.get('i').get('count').op(OP.i32Add).i32(8).op(OP.i32Mul).get('y').store(OP.f64Store, 3);
      f.get('i').i32(1).op(OP.i32Add).set('i').br('each');
    });
  });
  mod.define(index, f);
  const module = new WebAssembly.Module(mod.encode());
  return (inputs) => {
    const memory = new WebAssembly.Memory({ initial: Math.ceil((16 * inputs.length) / 65536) + 1 });
    const instance = new WebAssembly.Instance(module, { env: { memory } });
    new Float64Array(memory.buffer, 0, inputs.length).set(inputs);
    (instance.exports.apply as (count: number) => void)(inputs.length);
    return new Float64Array(memory.buffer, 8 * inputs.length, inputs.length).slice();
  };
}

const wasmExp = portModule(emitExp);
const wasmLog = portModule(emitLog);
const SAMPLE = 200_000;
const random = new Xoshiro128([0x2545f491, 0x9e3779b9, 0x6a09e667, 0xbb67ae85]);

function uniform(lo: number, hi: number, count = SAMPLE): Float64Array {
  return Float64Array.from({ length: count }, () => lo + (hi - lo) * random.nextOpenUnit());
}

/** Doubles from random bit patterns with the exponent field in [eLo, eHi] (positive). */
function byExponent(eLo: number, eHi: number, count = SAMPLE): Float64Array {
  const words = new Uint32Array(2);
  const value = new Float64Array(words.buffer);
  return Float64Array.from({ length: count }, () => {
    const exponent = eLo + Math.floor(random.nextOpenUnit() * (eHi - eLo + 1));
    words[0] = random.nextUint32();
    words[1] = (exponent << 20) | (random.nextUint32() & 0xfffff);
    return value[0]!;
  });
}

const SPECIALS = [
  0,
  -0,
  Infinity,
  -Infinity,
  Number.NaN,
  Number.MIN_VALUE,
  -Number.MIN_VALUE,
  2.2250738585072014e-308,
  2.225073858507201e-308,
  Number.MAX_VALUE,
  -Number.MAX_VALUE,
  1,
  -1,
  2 ** -28,
  -(2 ** -28),
  2 ** -29,
  7.09782712893383973096e2,
  7.097827128933841e2,
  -7.4513321910194110842e2,
  -7.451332191019412e2,
  -708.3964185322641,
  -708.4,
  -745,
  0.5,
  Math.LN2,
  -Math.LN2,
];

/** Indices where the two arrays differ in bits (NaN equals NaN). */
function mismatches(expected: ArrayLike<number>, actual: ArrayLike<number>, inputs: Float64Array): string[] {
  const found: string[] = [];
  for (let i = 0; i < inputs.length && found.length < 5; i++) {
    if (!Object.is(expected[i], actual[i])) found.push(`${inputs[i]}: ${expected[i]} vs ${actual[i]}`);
  }
  return found;
}

function ulpDistance(a: number, b: number): number {
  if (Object.is(a, b) || (Number.isNaN(a) && Number.isNaN(b))) return 0;
  const view = new DataView(new ArrayBuffer(16));
  view.setFloat64(0, a);
  view.setFloat64(8, b);
  return Math.abs(Number(view.getBigInt64(0) - view.getBigInt64(8)));
}

const EXP_RANGES: [string, Float64Array][] = [
  ['specials', Float64Array.from(SPECIALS)],
  ['the whole finite range', uniform(-745.2, 709.8)],
  ['[−1, 1]', uniform(-1, 1)],
  ['tiny arguments', uniform(-(2 ** -27), 2 ** -27)],
  ['near overflow', uniform(705, 709.79)],
  ['subnormal results', uniform(-745.14, -708)],
  ['the ziggurat’s wedge, −x²/2 for x in [0, 3.5]', uniform(-6.125, 0)],
];

const LOG_RANGES: [string, Float64Array][] = [
  ['specials', Float64Array.from(SPECIALS)],
  ['subnormals', byExponent(0, 0)],
  ['(0, 1)', uniform(0, 1)],
  ['near 1', uniform(1 - 1e-6, 1 + 1e-6)],
  ['every exponent', byExponent(1, 2046)],
  ['negative numbers', uniform(-1e6, 0)],
];

describe('the wasm ports of exp and log', () => {
  it.each(EXP_RANGES)('exp on %s gives the engine’s exp bit for bit', (_name, inputs) => {
    const expected = inputs.map((x) => PORTABLE_MATH.exp(x));
    expect(mismatches(expected, wasmExp(inputs), inputs)).toEqual([]);
  });

  it.each(LOG_RANGES)('log on %s gives the engine’s log bit for bit', (_name, inputs) => {
    const expected = inputs.map((x) => PORTABLE_MATH.log(x));
    expect(mismatches(expected, wasmLog(inputs), inputs)).toEqual([]);
  });

  it('stays within one ulp of Math.exp and Math.log', () => {
    const expInputs = uniform(-700, 700, 50_000);
    const logInputs = byExponent(1, 2046, 50_000);
    const exp = wasmExp(expInputs);
    const log = wasmLog(logInputs);
    const worstExp = Math.max(...Array.from(expInputs, (x, i) => ulpDistance(Math.exp(x), exp[i]!)));
    const worstLog = Math.max(...Array.from(logInputs, (x, i) => ulpDistance(Math.log(x), log[i]!)));
    expect(worstExp).toBeLessThanOrEqual(1);
    expect(worstLog).toBeLessThanOrEqual(1);
  });
});
