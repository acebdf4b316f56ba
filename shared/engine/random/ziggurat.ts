import { XOSHIRO_NEXT_SOURCE, type Xoshiro128 } from './xoshiro128';
import { PORTABLE_MATH } from '../../expr/portable-math';

/**
 * Standard normal sampler by the ziggurat method of Marsaglia & Tsang (2000), "The ziggurat
 * method for generating random variables", J. Stat. Softw. 5(8): 128 layers, tables built as in
 * their `zigset`, tail by Marsaglia's (1964) exponential rejection. Fed by 32-bit outputs of
 * xoshiro128** instead of the paper's SHR3, which sidesteps the generator weakness later reported
 * for the original code (Leong et al. 2005).
 */

/** Right edge of the base layer, r, and the common layer area v (Marsaglia & Tsang 2000, §4). */
const ZIGGURAT_R = 3.442619855899;
const ZIGGURAT_V = 9.91256303526217e-3;
const TWO_POW_31 = 2147483648;

export interface ZigguratTables {
  /** Acceptance thresholds for |hz| (integers below 2^31). */
  kn: Int32Array;
  /** Scale from the signed 32-bit integer hz to x. */
  wn: Float64Array;
  /** Density exp(−x²/2) at the layer edges. */
  fn: Float64Array;
}

export function buildZigguratTables(): ZigguratTables {
  const kn = new Int32Array(128);
  const wn = new Float64Array(128);
  const fn = new Float64Array(128);
  let dn = ZIGGURAT_R;
  let tn = dn;
  const q = ZIGGURAT_V / PORTABLE_MATH.exp(-0.5 * dn * dn);
  kn[0] = Math.trunc((dn / q) * TWO_POW_31);
  kn[1] = 0;
  wn[0] = q / TWO_POW_31;
  wn[127] = dn / TWO_POW_31;
  fn[0] = 1;
  fn[127] = PORTABLE_MATH.exp(-0.5 * dn * dn);
  for (let i = 126; i >= 1; i--) {
    dn = Math.sqrt(-2 * PORTABLE_MATH.log(ZIGGURAT_V / dn + PORTABLE_MATH.exp(-0.5 * dn * dn)));
    kn[i + 1] = Math.trunc((dn / tn) * TWO_POW_31);
    tn = dn;
    fn[i] = PORTABLE_MATH.exp(-0.5 * dn * dn);
    wn[i] = dn / TWO_POW_31;
  }
  return { kn, wn, fn };
}

/** Built once per module: the tables are constants. */
export const ZIGGURAT_TABLES: ZigguratTables = buildZigguratTables();

/** One standard normal draw from `generator` (outside the hot loop: tests, studies). */
export function normalFrom(generator: Xoshiro128, tables: ZigguratTables = ZIGGURAT_TABLES): number {
  const { kn, wn, fn } = tables;
  let hz = generator.nextUint32() | 0;
  let iz = hz & 127;
  if (Math.abs(hz) < kn[iz]!) return hz * wn[iz]!;
  for (;;) {
    const x = hz * wn[iz]!;
    if (iz === 0) {
      let tail: number;
      let y: number;
      do {
        tail = -PORTABLE_MATH.log(generator.nextOpenUnit()) / ZIGGURAT_R;
        y = -PORTABLE_MATH.log(generator.nextOpenUnit());
      } while (y + y < tail * tail);
      return hz > 0 ? ZIGGURAT_R + tail : -ZIGGURAT_R - tail;
    }
    if (fn[iz]! + generator.nextOpenUnit() * (fn[iz - 1]! - fn[iz]!) < PORTABLE_MATH.exp(-0.5 * x * x))
      return x;
    hz = generator.nextUint32() | 0;
    iz = hz & 127;
    if (Math.abs(hz) < kn[iz]!) return hz * wn[iz]!;
  }
}

/** Advances xoshiro128** held in gen[0..3] and returns the output as a signed int32. */
function nextInt32(gen: Int32Array): number {
  const s0 = gen[0]!;
  const s1 = gen[1]!;
  let s2 = gen[2]!;
  let s3 = gen[3]!;
  let r = Math.imul(s1, 5);
  r = Math.imul((r << 7) | (r >>> 25), 9);
  const t = s1 << 9;
  s2 ^= s0;
  s3 ^= s1;
  gen[1] = s1 ^ s2;
  gen[0] = s0 ^ s3;
  gen[2] = s2 ^ t;
  gen[3] = (s3 << 11) | (s3 >>> 21);
  return r;
}

function openUnit(gen: Int32Array): number {
  return ((nextInt32(gen) >>> 0) + 0.5) * 2.3283064365386963e-10;
}

/**
 * The ziggurat's rare branch (≈ 1.2 % of draws) for a first draw hz that failed the fast test, on
 * generator state gen[0..3] (updated in place). Kept out of the generated kernel so the hot loop
 * stays small; the kernel spills its generator state into `gen` only on this branch.
 */
export function normalSlowPath(firstHz: number, firstIz: number, gen: Int32Array): number {
  const { kn, wn, fn } = ZIGGURAT_TABLES;
  let hz = firstHz;
  let iz = firstIz;
  for (;;) {
    const x = hz * wn[iz]!;
    if (iz === 0) {
      let tail: number;
      let y: number;
      do {
        tail = -PORTABLE_MATH.log(openUnit(gen)) / ZIGGURAT_R;
        y = -PORTABLE_MATH.log(openUnit(gen));
      } while (y + y < tail * tail);
      return hz > 0 ? ZIGGURAT_R + tail : -ZIGGURAT_R - tail;
    }
    if (fn[iz]! + openUnit(gen) * (fn[iz - 1]! - fn[iz]!) < PORTABLE_MATH.exp(-0.5 * x * x)) return x;
    hz = nextInt32(gen);
    iz = hz & 127;
    if (Math.abs(hz) < kn[iz]!) return hz * wn[iz]!;
  }
}

/**
 * The kernel's fast-path table: entries 0…127 are wn, entries 128…255 are kn² as doubles. The
 * test |hz| < kn[iz] is done as hz·hz < kn[iz]² in doubles, which gives the same answer for every
 * 32-bit hz (squares below 2^62 round monotonically, and distinct integer squares near kn² differ
 * by about 2·kn, far more than a rounding step), needs no branch on the sign of hz and reads a
 * single typed array for both the test and the scale.
 */
export function buildFastTable(tables: ZigguratTables = ZIGGURAT_TABLES): Float64Array {
  const table = new Float64Array(256);
  for (let i = 0; i < 128; i++) {
    table[i] = tables.wn[i]!;
    table[128 + i] = tables.kn[i]! * tables.kn[i]!;
  }
  return table;
}

export const ZIGGURAT_FAST_TABLE: Float64Array = buildFastTable();

/**
 * Source text of the ziggurat's fast path on the generator state x0..x3: one generator step,
 * then either a standard normal in `target` or, when the draw needs the rare branch (≈ 1.2 %),
 * `onReject` with the draw's r and iz left for `normalSlowPathSource`. Expects locals r, xt, iz,
 * rf (a double) and the table `zt` (ZIGGURAT_FAST_TABLE) in scope.
 */
export function fastNormalDrawSource(target: string, onReject: string): string {
  return `${XOSHIRO_NEXT_SOURCE} iz = r & 127; rf = r;
if (!(rf * rf < zt[iz + 128])) { ${onReject} }
${target} = rf * zt[iz];`;
}

/**
 * Source text that finishes a draw whose fast test failed (r, iz as left by the fast path): spills
 * the generator state into the scratch Int32Array `gen`, calls `normalSlowPath` and takes the
 * state back.
 */
export function normalSlowPathSource(target: string): string {
  return `gen[0] = x0; gen[1] = x1; gen[2] = x2; gen[3] = x3;
${target} = normalSlowPath(r, iz, gen);
x0 = gen[0]; x1 = gen[1]; x2 = gen[2]; x3 = gen[3];`;
}

/**
 * Source text that leaves one standard normal draw in `target`, on the generator state x0..x3
 * (fast path inline, rare branch through `normalSlowPath`). Same algorithm and stream as
 * `normalFrom`.
 */
export function normalDrawSource(target: string): string {
  return `${XOSHIRO_NEXT_SOURCE} iz = r & 127; rf = r;
if (rf * rf < zt[iz + 128]) { ${target} = rf * zt[iz]; } else {
  ${normalSlowPathSource(target)}
}`;
}
