import { FunctionBody, ModuleBuilder } from './emitter';
import { I32, I64, OP } from './opcodes';

/**
 * FNV-1a 64 (digest.ts) over whole 8-byte words in wasm, where i64 arithmetic makes a byte cost an
 * xor and a multiplication instead of digest.ts's four 16-bit limbs. A run's digest reads every
 * saved value, loss time and cause: about 0.5 MB for the OU bench case, 2.8 ms in JavaScript.
 *
 * Memory: the hash state at 0 (an i64, little-endian, as the limbs l0 … l3), the words from 16.
 * hash(end) hashes the words 16 … end − 1, in order, into the state, each NaN as the canonical
 * NaN 0x7ff8000000000000, as digest.ts does.
 */
const PRIME = 0x100000001b3n;
export const WORDS_OFFSET = 16;

function buildModule(): Uint8Array<ArrayBuffer> {
  const mod = new ModuleBuilder();
  const index = mod.declareFunction([I32], [], 'hash');
  const f = new FunctionBody([['end', I32]], []);
  f.local('h', I64);
  f.local('w', I64);
  f.local('p', I32);
  f.i32(0).load(OP.i64Load, 3).set('h');
  f.i32(WORDS_OFFSET).set('p');
  f.block('done', () => {
    f.loop('words', () => {
      f.get('p').get('end').op(OP.i32GeS).brIf('done');
      f.get('p').load(OP.i64Load, 3).set('w');
      // Every NaN as the one canonical NaN (digest.ts): |w| above the bits of +∞ is a NaN.
      f.get('w').i64(0x7fffffffffffffffn).op(OP.i64And).i64(0x7ff0000000000000n).op(OP.i64GtU);
      f.if(() => f.i64(0x7ff8000000000000n).set('w'));
      for (let b = 0; b < 8; b++) {
        f.get('h').get('w');
        if (b > 0) f.i64(BigInt(8 * b)).op(OP.i64ShrU);
        if (b < 7) f.i64(0xffn).op(OP.i64And);
        f.op(OP.i64Xor).i64(PRIME).op(OP.i64Mul).set('h');
      }
      f.get('p').i32(8).op(OP.i32Add).set('p').br('words');
    });
  });
  f.i32(0).get('h').store(OP.i64Store, 3);
  mod.define(index, f);
  return mod.encode();
}

export interface WasmHasher {
  /** The memory's bytes as 64-bit words from WORDS_OFFSET, at least `count` of them. */
  words(count: number): Float64Array;
  /** The state limbs (l0 … l3, least significant first) in and out. */
  state: Uint16Array;
  hash(count: number): void;
}

let hasher: WasmHasher | null | undefined;

/** The wasm hasher, or null where WebAssembly is missing or refused (digest.ts then hashes in JavaScript). */
export function wasmHasher(): WasmHasher | null {
  if (hasher !== undefined) return hasher;
  hasher = null;
  if (typeof WebAssembly !== 'object' || new Uint8Array(Uint16Array.of(1).buffer)[0] !== 1) return hasher;
  try {
    const memory = new WebAssembly.Memory({ initial: 1 });
    const instance = new WebAssembly.Instance(new WebAssembly.Module(buildModule()), { env: { memory } });
    const run = instance.exports.hash as (end: number) => void;
    let view = new Float64Array(memory.buffer);
    const current: WasmHasher = {
      words(count) {
        const bytes = WORDS_OFFSET + 8 * count;
        if (bytes > memory.buffer.byteLength)
          memory.grow(Math.ceil((bytes - memory.buffer.byteLength) / 65536));
        if (view.buffer !== memory.buffer) {
          view = new Float64Array(memory.buffer);
          current.state = new Uint16Array(memory.buffer, 0, 4);
        }
        return view.subarray(WORDS_OFFSET / 8, WORDS_OFFSET / 8 + count);
      },
      state: new Uint16Array(memory.buffer, 0, 4),
      hash(count) {
        run(WORDS_OFFSET + 8 * count);
      },
    };
    hasher = current;
  } catch {
    // A page whose policy refuses wasm: the JavaScript digest gives the same bits.
    hasher = null;
  }
  return hasher;
}
