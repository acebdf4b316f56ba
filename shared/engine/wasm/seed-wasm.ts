import type { FunctionBody } from './emitter';
import { I64, OP } from './opcodes';
import { SEED_OFFSET } from './memory-layout';

/**
 * The generator seeds of a group's four paths, made in wasm with i64 arithmetic exactly as
 * streamSeed (random/stream-seed.ts) makes them in 32-bit halves: the key seed·2^32 + path index
 * scrambled by splitmix64's finaliser, then the finaliser of key + golden and key + 2·golden as
 * the four 32-bit words (high word first). Done per group in the run function, this saves the
 * chunk's JavaScript seeding loop (about 1 ms per 10,000 paths, more while V8 warms it up).
 */
const GOLDEN = 0x9e3779b97f4a7c15n;
const M1 = 0xbf58476d1ce4e5b9n;
const M2 = 0x94d049bb133111ebn;

export function declareSeedLocals(f: FunctionBody): void {
  for (const name of ['sk', 'sa', 'sb']) f.local(name, I64);
}

/** z ↦ splitmix64's finaliser of z, for the i64 on the stack, into `into`. */
function mix(f: FunctionBody, into: string): void {
  f.set(into);
  const shiftXor = (bits: number): void =>
    void f.get(into).get(into).i64(BigInt(bits)).op(OP.i64ShrU).op(OP.i64Xor);
  shiftXor(30);
  f.i64(BigInt.asIntN(64, M1)).op(OP.i64Mul).set(into);
  shiftXor(27);
  f.i64(BigInt.asIntN(64, M2)).op(OP.i64Mul).set(into);
  shiftXor(31);
  f.set(into);
}

/**
 * Writes the seeds of paths firstPath + p … firstPath + p + 3 at SEED_OFFSET, given locals p and
 * base_seed, base_firstPath (the header's words).
 */
export function emitGroupSeeds(f: FunctionBody): void {
  for (let lane = 0; lane < 4; lane++) {
    const word = (w: number): number => SEED_OFFSET + 16 * w + 4 * lane;
    f.get('base_seed').op(OP.i64ExtendI32U).i64(32n).op(OP.i64Shl);
    f.get('base_firstPath').get('p').op(OP.i32Add).i32(lane).op(OP.i32Add).op(OP.i64ExtendI32U);
    f.op(OP.i64Or);
    mix(f, 'sk');
    f.get('sk').i64(BigInt.asIntN(64, GOLDEN)).op(OP.i64Add);
    mix(f, 'sa');
    f.get('sk')
      .i64(BigInt.asIntN(64, 2n * GOLDEN))
      .op(OP.i64Add);
    mix(f, 'sb');
    // xoshiro must not start from the all-zero state (as streamSeed: the first word becomes 1).
    f.get('sa').get('sb').op(OP.i64Or).op(OP.i64Eqz);
    f.if(() => f.i64(1n << 32n).set('sa'));
    f.i32(0).get('sa').i64(32n).op(OP.i64ShrU).op(OP.i32WrapI64).store(OP.i32Store, 2, word(0));
    f.i32(0).get('sa').op(OP.i32WrapI64).store(OP.i32Store, 2, word(1));
    f.i32(0).get('sb').i64(32n).op(OP.i64ShrU).op(OP.i32WrapI64).store(OP.i32Store, 2, word(2));
    f.i32(0).get('sb').op(OP.i32WrapI64).store(OP.i32Store, 2, word(3));
  }
}
