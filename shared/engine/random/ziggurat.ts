import { XOSHIRO_NEXT_SOURCE, type Xoshiro128 } from './xoshiro128';

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
  const q = ZIGGURAT_V / Math.exp(-0.5 * dn * dn);
  kn[0] = Math.trunc((dn / q) * TWO_POW_31);
  kn[1] = 0;
  wn[0] = q / TWO_POW_31;
  wn[127] = dn / TWO_POW_31;
  fn[0] = 1;
  fn[127] = Math.exp(-0.5 * dn * dn);
  for (let i = 126; i >= 1; i--) {
    dn = Math.sqrt(-2 * Math.log(ZIGGURAT_V / dn + Math.exp(-0.5 * dn * dn)));
    kn[i + 1] = Math.trunc((dn / tn) * TWO_POW_31);
    tn = dn;
    fn[i] = Math.exp(-0.5 * dn * dn);
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
        tail = -Math.log(generator.nextOpenUnit()) / ZIGGURAT_R;
        y = -Math.log(generator.nextOpenUnit());
      } while (y + y < tail * tail);
      return hz > 0 ? ZIGGURAT_R + tail : -ZIGGURAT_R - tail;
    }
    if (fn[iz]! + generator.nextOpenUnit() * (fn[iz - 1]! - fn[iz]!) < Math.exp(-0.5 * x * x)) return x;
    hz = generator.nextUint32() | 0;
    iz = hz & 127;
    if (Math.abs(hz) < kn[iz]!) return hz * wn[iz]!;
  }
}

const UNIT = '2.3283064365386963e-10';

/**
 * Source text that leaves one standard normal draw in `target`, on the generator state x0..x3.
 * Expects locals r, xt, iz, zx, zy, zs and the tables kn, wn, fn in scope. Same algorithm as
 * `normalFrom`, inlined so the fast path (≈ 99 % of draws) costs one generator step, one table
 * lookup and one multiply.
 */
export function normalDrawSource(target: string): string {
  const next = XOSHIRO_NEXT_SOURCE;
  const uniform = `((r >>> 0) + 0.5) * ${UNIT}`;
  return `${next} iz = r & 127;
if ((r < 0 ? -r : r) < kn[iz]) { ${target} = r * wn[iz]; } else {
  for (;;) {
    zx = r * wn[iz];
    if (iz === 0) {
      zs = r > 0;
      do { ${next} zx = -Math.log(${uniform}) / ${ZIGGURAT_R}; ${next} zy = -Math.log(${uniform}); } while (zy + zy < zx * zx);
      ${target} = zs ? ${ZIGGURAT_R} + zx : -${ZIGGURAT_R} - zx; break;
    }
    zy = zx; ${next}
    if (fn[iz] + ${uniform} * (fn[iz - 1] - fn[iz]) < Math.exp(-0.5 * zy * zy)) { ${target} = zy; break; }
    ${next} iz = r & 127;
    if ((r < 0 ? -r : r) < kn[iz]) { ${target} = r * wn[iz]; break; }
  }
}`;
}
