/**
 * xoshiro128** 1.1 (Blackman & Vigna 2018, "Scrambled linear pseudorandom number generators"),
 * 32-bit output, period 2^128 − 1. The class is for code outside the hot loop (tests, studies);
 * the simulation kernel inlines the same steps from `XOSHIRO_NEXT_SOURCE`.
 */
export class Xoshiro128 {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  constructor(state: ArrayLike<number>) {
    this.s0 = state[0]! | 0;
    this.s1 = state[1]! | 0;
    this.s2 = state[2]! | 0;
    this.s3 = state[3]! | 0;
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0)
      throw new RangeError('xoshiro128** needs a state that is not all zero');
  }

  /** Next output as an unsigned 32-bit integer. */
  nextUint32(): number {
    const s1 = this.s1;
    let r = Math.imul(s1, 5);
    r = Math.imul((r << 7) | (r >>> 25), 9);
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= s1;
    this.s1 = s1 ^ this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = (this.s3 << 11) | (this.s3 >>> 21);
    return r >>> 0;
  }

  /** Uniform on the open interval (0, 1), with 32 bits of resolution. */
  nextOpenUnit(): number {
    return (this.nextUint32() + 0.5) * 2.3283064365386963e-10;
  }
}

/**
 * Source text of one xoshiro128** step on local variables x0..x3, leaving the 32-bit output
 * (as a signed int32) in `r`. Used by the code generator.
 */
export const XOSHIRO_NEXT_SOURCE =
  'r = Math.imul(x1, 5); r = Math.imul((r << 7) | (r >>> 25), 9); ' +
  'xt = x1 << 9; x2 ^= x0; x3 ^= x1; x1 ^= x2; x0 ^= x3; x2 ^= xt; x3 = (x3 << 11) | (x3 >>> 21);';
