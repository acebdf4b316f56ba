// Just over 300 lines: the byte writer and the two builders that share it (a function body, a
// module) belong together; the opcode tables are in opcodes.ts.
/**
 * A small WebAssembly binary emitter for the subset the simulation kernel needs: one memory
 * (imported), imported functions, internal functions with i32/f64/v128 locals, structured
 * control flow with named labels, and the SIMD instructions listed in `SIMD`. No text format and
 * no assembler: the kernel builder calls these methods directly (Core Specification 2.0, §5).
 */
import { OP, SIMD, type ValueType } from './opcodes';

/** Scratch for writing an f64's little-endian bytes. */
const F64_SCRATCH = new DataView(new ArrayBuffer(8));
const F64_BYTES = new Uint8Array(F64_SCRATCH.buffer);

/** A growing byte buffer (a kernel module is 10-40 KB, built once per plan shape). */
class Bytes {
  private buffer = new Uint8Array(1024);
  private length = 0;
  /** The bytes written so far (a view; copy it to keep it past later writes). */
  get out(): Uint8Array<ArrayBuffer> {
    return this.buffer.subarray(0, this.length);
  }
  private room(count: number): void {
    if (this.length + count <= this.buffer.length) return;
    const grown = new Uint8Array(Math.max(2 * this.buffer.length, this.length + count));
    grown.set(this.buffer.subarray(0, this.length));
    this.buffer = grown;
  }
  private push(b: number): void {
    this.room(1);
    this.buffer[this.length++] = b;
  }
  byte(b: number): this {
    this.push(b & 0xff);
    return this;
  }
  u32(value: number): this {
    let v = value >>> 0;
    do {
      let b = v & 0x7f;
      v >>>= 7;
      if (v !== 0) b |= 0x80;
      this.push(b);
    } while (v !== 0);
    return this;
  }
  s32(value: number): this {
    let v = value | 0;
    for (;;) {
      const b = v & 0x7f;
      v >>= 7;
      const done = (v === 0 && (b & 0x40) === 0) || (v === -1 && (b & 0x40) !== 0);
      this.push(done ? b : b | 0x80);
      if (done) return this;
    }
  }
  /** Signed LEB128 of a 64-bit value given as a bigint. */
  s64(value: bigint): this {
    let v = BigInt.asIntN(64, value);
    for (;;) {
      const b = Number(v & 0x7fn);
      v >>= 7n;
      const done = (v === 0n && (b & 0x40) === 0) || (v === -1n && (b & 0x40) !== 0);
      this.push(done ? b : b | 0x80);
      if (done) return this;
    }
  }
  f64(value: number): this {
    F64_SCRATCH.setFloat64(0, value, true);
    return this.bytes(F64_BYTES);
  }
  bytes(list: ArrayLike<number>): this {
    this.room(list.length);
    if (list instanceof Uint8Array) this.buffer.set(list, this.length);
    else for (let i = 0; i < list.length; i++) this.buffer[this.length + i] = list[i]! & 0xff;
    this.length += list.length;
    return this;
  }
  vec(items: number[][]): this {
    this.u32(items.length);
    for (const item of items) this.bytes(item);
    return this;
  }
  name(text: string): this {
    const encoded = new TextEncoder().encode(text);
    return this.u32(encoded.length).bytes(encoded);
  }
}

/** Memory argument: natural alignment (log2 bytes) and a constant offset. */
function memarg(b: Bytes, align: number, offset: number): void {
  b.u32(align).u32(offset);
}

/**
 * The body of one function: locals by name, instructions, and control labels resolved by name
 * (so `br('segment')` needs no hand-counted depth).
 */
export class FunctionBody {
  private readonly code = new Bytes();
  private readonly labels: string[] = [];
  private readonly localTypes: ValueType[] = [];
  private readonly localIndex = new Map<string, number>();

  constructor(
    readonly params: readonly [string, ValueType][],
    readonly results: readonly ValueType[],
  ) {
    params.forEach(([name], i) => this.localIndex.set(name, i));
  }

  local(name: string, type: ValueType): string {
    if (!this.localIndex.has(name)) {
      this.localIndex.set(name, this.params.length + this.localTypes.length);
      this.localTypes.push(type);
    }
    return name;
  }

  private indexOf(name: string): number {
    const index = this.localIndex.get(name);
    if (index === undefined) throw new Error(`no local named ${name}`);
    return index;
  }

  get(name: string): this {
    this.code.byte(OP.localGet).u32(this.indexOf(name));
    return this;
  }
  set(name: string): this {
    this.code.byte(OP.localSet).u32(this.indexOf(name));
    return this;
  }
  tee(name: string): this {
    this.code.byte(OP.localTee).u32(this.indexOf(name));
    return this;
  }
  op(...codes: number[]): this {
    for (const c of codes) this.code.byte(c);
    return this;
  }
  simd(code: number): this {
    this.code.byte(0xfd).u32(code);
    return this;
  }
  lane(code: number, laneIndex: number): this {
    this.simd(code);
    this.code.byte(laneIndex);
    return this;
  }
  shuffle(lanes: number[]): this {
    this.simd(SIMD.i8x16Shuffle);
    this.code.bytes(lanes);
    return this;
  }
  i32(value: number): this {
    this.code.byte(OP.i32Const).s32(value);
    return this;
  }
  i64(value: bigint): this {
    this.code.byte(OP.i64Const).s64(value);
    return this;
  }
  f64(value: number): this {
    this.code.byte(OP.f64Const).f64(value);
    return this;
  }
  /** A v128 constant with both f64 lanes equal to `value`. */
  f64x2(value: number): this {
    this.simd(SIMD.v128Const);
    this.code.f64(value).f64(value);
    return this;
  }
  /** A v128 constant from 16 bytes. */
  v128(bytes: number[]): this {
    this.simd(SIMD.v128Const);
    this.code.bytes(bytes);
    return this;
  }
  load(opcode: number, align: number, offset = 0): this {
    this.code.byte(opcode);
    memarg(this.code, align, offset);
    return this;
  }
  store(opcode: number, align: number, offset = 0): this {
    return this.load(opcode, align, offset);
  }
  v128Load(offset = 0): this {
    this.simd(SIMD.v128Load);
    memarg(this.code, 3, offset);
    return this;
  }
  v128Store(offset = 0): this {
    this.simd(SIMD.v128Store);
    memarg(this.code, 3, offset);
    return this;
  }
  call(functionIndex: number): this {
    this.code.byte(OP.call).u32(functionIndex);
    return this;
  }

  /** `block label … end`; `result` is a block type (0x40 for none). */
  block(label: string, body: () => void, result = 0x40): this {
    this.code.byte(OP.block).byte(result);
    this.labels.push(label);
    body();
    this.labels.pop();
    this.code.byte(OP.end);
    return this;
  }
  loop(label: string, body: () => void): this {
    this.code.byte(OP.loop).byte(0x40);
    this.labels.push(label);
    body();
    this.labels.pop();
    this.code.byte(OP.end);
    return this;
  }
  /** `if … [else …] end` on the i32 on the stack. */
  if(then: () => void, otherwise?: () => void, result = 0x40): this {
    this.code.byte(OP.if).byte(result);
    this.labels.push('');
    then();
    if (otherwise) {
      this.code.byte(OP.else);
      otherwise();
    }
    this.labels.pop();
    this.code.byte(OP.end);
    return this;
  }
  private depth(label: string): number {
    const at = this.labels.lastIndexOf(label);
    if (at < 0) throw new Error(`no enclosing label ${label}`);
    return this.labels.length - 1 - at;
  }
  br(label: string): this {
    this.code.byte(OP.br).u32(this.depth(label));
    return this;
  }
  /** `br_table`: to labels[i] for i on the stack, else to `otherwise`. */
  brTable(labels: string[], otherwise: string): this {
    this.code.byte(0x0e).u32(labels.length);
    for (const label of labels) this.code.u32(this.depth(label));
    this.code.u32(this.depth(otherwise));
    return this;
  }
  brIf(label: string): this {
    this.code.byte(OP.brIf).u32(this.depth(label));
    return this;
  }

  encode(): Uint8Array {
    const b = new Bytes();
    // Locals, run-length encoded by type.
    const groups: [number, ValueType][] = [];
    for (const type of this.localTypes) {
      const last = groups[groups.length - 1];
      if (last && last[1] === type) last[0]++;
      else groups.push([1, type]);
    }
    b.u32(groups.length);
    for (const [count, type] of groups) b.u32(count).byte(type);
    b.bytes(this.code.out).byte(OP.end);
    const body = new Bytes();
    body.u32(b.out.length).bytes(b.out);
    return body.out;
  }
}

interface Signature {
  params: ValueType[];
  results: ValueType[];
}

/** A module: imported memory and functions first, then the internal functions, some exported. */
export class ModuleBuilder {
  private readonly types: Signature[] = [];
  private readonly imports: { module: string; name: string; type: number }[] = [];
  private readonly functions: { type: number; body: FunctionBody | null; exportName?: string }[] = [];
  private sealedImports = false;

  private typeIndex(sig: Signature): number {
    const key = JSON.stringify(sig);
    const found = this.types.findIndex((t) => JSON.stringify(t) === key);
    if (found >= 0) return found;
    this.types.push(sig);
    return this.types.length - 1;
  }

  /** Imports a function (all imports come before any internal function); returns its index. */
  importFunction(module: string, name: string, params: ValueType[], results: ValueType[]): number {
    if (this.sealedImports) throw new Error('imports must come before internal functions');
    this.imports.push({ module, name, type: this.typeIndex({ params, results }) });
    return this.imports.length - 1;
  }

  /** Declares an internal function (its body may be filled in later); returns its index. */
  declareFunction(params: ValueType[], results: ValueType[], exportName?: string): number {
    this.sealedImports = true;
    this.functions.push({ type: this.typeIndex({ params, results }), body: null, exportName });
    return this.imports.length + this.functions.length - 1;
  }

  define(index: number, body: FunctionBody): void {
    this.functions[index - this.imports.length]!.body = body;
  }

  encode(): Uint8Array<ArrayBuffer> {
    const out = new Bytes().bytes([0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00]);
    const section = (id: number, content: Bytes): void => {
      out.byte(id).u32(content.out.length).bytes(content.out);
    };
    const types = new Bytes().u32(this.types.length);
    for (const t of this.types) {
      types.byte(0x60).u32(t.params.length).bytes(t.params).u32(t.results.length).bytes(t.results);
    }
    section(1, types);
    const imports = new Bytes().u32(this.imports.length + 1);
    imports.name('env').name('memory').byte(0x02).byte(0x00).u32(1);
    for (const imp of this.imports) imports.name(imp.module).name(imp.name).byte(0x00).u32(imp.type);
    section(2, imports);
    const funcs = new Bytes().u32(this.functions.length);
    for (const f of this.functions) funcs.u32(f.type);
    section(3, funcs);
    const exported = this.functions
      .map((f, i) => ({ name: f.exportName, index: this.imports.length + i }))
      .filter((e): e is { name: string; index: number } => e.name !== undefined);
    const exports = new Bytes().u32(exported.length);
    for (const e of exported) exports.name(e.name).byte(0x00).u32(e.index);
    section(7, exports);
    const code = new Bytes().u32(this.functions.length);
    for (const f of this.functions) {
      if (f.body === null) throw new Error('a declared function has no body');
      code.bytes(f.body.encode());
    }
    section(10, code);
    return out.out.slice();
  }
}
