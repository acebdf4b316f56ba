import { wasmHasher } from './wasm/fnv-wasm';

/**
 * FNV-1a 64-bit hash (Fowler, Noll & Vo; offset basis 0xcbf29ce484222325, prime 0x100000001b3)
 * over the little-endian IEEE-754 bytes of numbers. Identical numbers give identical digests on
 * every platform. Computed with four 16-bit limbs so it needs no BigInt; long arrays go through
 * the wasm hasher (wasm/fnv-wasm.ts) where there is one, with the same bits.
 */
/** Numbers hashed per block by addNumbers (through a typed-array view rather than a DataView call each). */
const BLOCK = 1024;
/** Arrays at least this long are hashed by the wasm hasher where there is one (the same bits, faster). */
const WASM_MIN_NUMBERS = 64;
const LITTLE_ENDIAN = new Uint8Array(Uint32Array.of(1).buffer)[0] === 1;

export class Fnv1a64 {
  // Limbs, least significant first.
  private l0 = 0x2325;
  private l1 = 0x8422;
  private l2 = 0x9ce4;
  private l3 = 0xcbf2;
  private readonly view = new DataView(new ArrayBuffer(8));
  private readonly block = new Float64Array(BLOCK);
  private readonly words = new Uint32Array(this.block.buffer);
  private readonly bytes = new Uint8Array(this.block.buffer);

  private byte(value: number): void {
    const x0 = this.l0 ^ value;
    // Multiply by 2^40 + 0x1b3: 0x1b3 touches every limb, 2^40 adds limb0·2^8 into limb 2 and up.
    const p0 = x0 * 0x1b3;
    const p1 = this.l1 * 0x1b3 + (p0 >>> 16);
    const p2 = this.l2 * 0x1b3 + (p1 >>> 16) + ((x0 << 8) & 0xffff);
    const p3 = this.l3 * 0x1b3 + (p2 >>> 16) + (this.l1 << 8) + (x0 >>> 8);
    this.l0 = p0 & 0xffff;
    this.l1 = p1 & 0xffff;
    this.l2 = p2 & 0xffff;
    this.l3 = p3 & 0xffff;
  }

  addNumber(value: number): this {
    if (value === value) {
      this.view.setFloat64(0, value, true);
    } else {
      // One canonical NaN: engines may keep different NaN bit patterns for the same result.
      this.view.setUint32(0, 0, true);
      this.view.setUint32(4, 0x7ff80000, true);
    }
    for (let i = 0; i < 8; i++) this.byte(this.view.getUint8(i));
    return this;
  }

  addBytes(bytes: ArrayLike<number>): this {
    for (let i = 0; i < bytes.length; i++) this.byte(bytes[i]! & 0xff);
    return this;
  }

  addNumbers(values: ArrayLike<number>): this {
    const wasm = values.length >= WASM_MIN_NUMBERS ? wasmHasher() : null;
    if (wasm !== null) {
      // The hasher makes every NaN the canonical one itself.
      wasm.words(values.length).set(values);
      const state = wasm.state;
      state[0] = this.l0;
      state[1] = this.l1;
      state[2] = this.l2;
      state[3] = this.l3;
      wasm.hash(values.length);
      this.l0 = state[0]!;
      this.l1 = state[1]!;
      this.l2 = state[2]!;
      this.l3 = state[3]!;
      return this;
    }
    const words = this.words;
    const bytes = this.bytes;
    const block = this.block;
    for (let start = 0; start < values.length; start += BLOCK) {
      const count = Math.min(BLOCK, values.length - start);
      for (let i = 0; i < count; i++) {
        const value = values[start + i]!;
        block[i] = value;
        // The same canonical NaN as addNumber (a NaN is the only value unequal to itself).
        if (value !== value) {
          words[2 * i] = 0;
          words[2 * i + 1] = 0x7ff80000;
        }
      }
      // Typed arrays use the platform's byte order; the digest is defined on little-endian bytes.
      if (LITTLE_ENDIAN) {
        // this.byte inlined, with the limbs in locals: the digest reads every saved value of a run.
        let l0 = this.l0;
        let l1 = this.l1;
        let l2 = this.l2;
        let l3 = this.l3;
        for (let i = 0; i < count * 8; i++) {
          const x0 = l0 ^ bytes[i]!;
          const p0 = x0 * 0x1b3;
          const p1 = l1 * 0x1b3 + (p0 >>> 16);
          const p2 = l2 * 0x1b3 + (p1 >>> 16) + ((x0 << 8) & 0xffff);
          const p3 = l3 * 0x1b3 + (p2 >>> 16) + (l1 << 8) + (x0 >>> 8);
          l0 = p0 & 0xffff;
          l1 = p1 & 0xffff;
          l2 = p2 & 0xffff;
          l3 = p3 & 0xffff;
        }
        this.l0 = l0;
        this.l1 = l1;
        this.l2 = l2;
        this.l3 = l3;
      } else {
        for (let i = 0; i < count; i++) this.addNumber(block[i]!);
      }
    }
    return this;
  }

  addText(text: string): this {
    for (let i = 0; i < text.length; i++) {
      const code = text.charCodeAt(i);
      this.byte(code & 0xff);
      this.byte(code >>> 8);
    }
    return this;
  }

  hex(): string {
    return [this.l3, this.l2, this.l1, this.l0].map((limb) => limb.toString(16).padStart(4, '0')).join('');
  }
}
