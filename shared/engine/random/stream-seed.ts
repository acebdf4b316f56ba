/**
 * Per-path generator seeding: the state of path `pathIndex` under run seed `seed` depends on
 * those two numbers only, so results do not depend on how paths are split across workers.
 *
 * The 64-bit key seed · 2^32 + pathIndex is scrambled with splitmix64's finaliser (Steele, Lea &
 * Flood 2014, "Fast splittable pseudorandom number generators"; constants from Vigna's
 * splitmix64.c), and two further splitmix64 outputs give the four 32-bit words of xoshiro128**.
 * Everything is done in 32-bit halves so no BigInt is allocated per path.
 */

const GOLDEN_HI = 0x9e3779b9;
const GOLDEN_LO = 0x7f4a7c15;
const M1_HI = 0xbf58476d;
const M1_LO = 0x1ce4e5b9;
const M2_HI = 0x94d049bb;
const M2_LO = 0x133111eb;

/** High 32 bits of the 64-bit product of two unsigned 32-bit numbers. */
function mulHigh32(a: number, b: number): number {
  const a0 = a & 0xffff;
  const a1 = a >>> 16;
  const b0 = b & 0xffff;
  const b1 = b >>> 16;
  const lowLow = a0 * b0;
  const mid1 = a1 * b0;
  const mid2 = a0 * b1;
  const carry = ((lowLow >>> 16) + (mid1 & 0xffff) + (mid2 & 0xffff)) >>> 16;
  return (a1 * b1 + (mid1 >>> 16) + (mid2 >>> 16) + carry) >>> 0;
}

/** Scratch for the 64-bit value being mixed: [hi, lo]. */
const word = new Uint32Array(2);

/** (hi, lo) · (mHi, mLo) mod 2^64, into `word`. */
function mul64(hi: number, lo: number, mHi: number, mLo: number): void {
  const low = Math.imul(lo, mLo) >>> 0;
  const high = (mulHigh32(lo, mLo) + Math.imul(hi, mLo) + Math.imul(lo, mHi)) >>> 0;
  word[0] = high;
  word[1] = low;
}

/** splitmix64's output function z ↦ mix(z), in place on `word`. */
function mix64(): void {
  let hi = word[0]!;
  let lo = word[1]!;
  // z ^= z >>> 30
  lo = (lo ^ ((lo >>> 30) | (hi << 2))) >>> 0;
  hi = (hi ^ (hi >>> 30)) >>> 0;
  mul64(hi, lo, M1_HI, M1_LO);
  hi = word[0]!;
  lo = word[1]!;
  // z ^= z >>> 27
  lo = (lo ^ ((lo >>> 27) | (hi << 5))) >>> 0;
  hi = (hi ^ (hi >>> 27)) >>> 0;
  mul64(hi, lo, M2_HI, M2_LO);
  hi = word[0]!;
  lo = word[1]!;
  // z ^= z >>> 31
  lo = (lo ^ ((lo >>> 31) | (hi << 1))) >>> 0;
  hi = (hi ^ (hi >>> 31)) >>> 0;
  word[0] = hi;
  word[1] = lo;
}

/** Adds the golden-ratio increment to (hi, lo) and returns mix64 of the sum in `word`. */
function advanceAndMix(hi: number, lo: number): void {
  const sumLo = (lo + GOLDEN_LO) >>> 0;
  const carry = sumLo < lo ? 1 : 0;
  word[0] = (hi + GOLDEN_HI + carry) >>> 0;
  word[1] = sumLo;
  mix64();
}

/**
 * Writes the xoshiro128** state of path `pathIndex` under `seed` into out[offset..offset+3].
 * seed and pathIndex are unsigned 32-bit integers.
 */
export function streamSeed(seed: number, pathIndex: number, out: Uint32Array, offset = 0): void {
  // Scramble the key first, so neighbouring keys start far apart in the splitmix sequence.
  word[0] = seed >>> 0;
  word[1] = pathIndex >>> 0;
  mix64();
  const keyHi = word[0]!;
  const keyLo = word[1]!;
  advanceAndMix(keyHi, keyLo);
  out[offset] = word[0]!;
  out[offset + 1] = word[1]!;
  // Second output: key + 2·golden.
  const lo1 = (keyLo + GOLDEN_LO) >>> 0;
  const hi1 = (keyHi + GOLDEN_HI + (lo1 < keyLo ? 1 : 0)) >>> 0;
  advanceAndMix(hi1, lo1);
  out[offset + 2] = word[0]!;
  out[offset + 3] = word[1]!;
  // xoshiro must not start from the all-zero state (probability 2^-128, but cheap to exclude).
  if ((out[offset]! | out[offset + 1]! | out[offset + 2]! | out[offset + 3]!) === 0) out[offset] = 1;
}
