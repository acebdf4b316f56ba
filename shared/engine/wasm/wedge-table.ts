import { ZIGGURAT_TABLES } from '../random/ziggurat';

/**
 * The ziggurat's wedge test without exp, where that is certain. A lane in layer i (1 ≤ i ≤ 127)
 * whose fast test failed has |x| between x_{i−1} and x_i (x_0 = 0, x_i = wn[i]·2^31), so y = x² lies
 * in [y0, y1] = [x_{i−1}², x_i²]. There exp(−y/2) is its Taylor cubic about the middle ym,
 *   c0 = exp(−ym/2), c1 = −c0/2, c2 = c0/8, c3 = −c0/48,
 * within the Lagrange remainder e^{−y0/2}/16 · (Δy/2)⁴/24 (the fourth derivative of exp(−y/2) is
 * exp(−y/2)/16). The band is twice that remainder plus 1e-14, which also covers the rounding of the
 * cubic, of x² and of the exp port (each a few units in the last place of numbers at most 1).
 * The test u-point A = fn[i] + u·(fn[i−1] − fn[i]) is then surely below exp(−x²/2) when A < P − band
 * and surely not when A ≥ P + band; only in between (0.6 % of wedge tests in the widest layer,
 * about 0.01 % over all layers) does the kernel compute exp, and it decides exactly as the
 * JavaScript kernel does. The cubic is seven dependent operations against exp's fifteen and a
 * division, and the hot loop waits for the wedge test's result: the OU bench kernel ran about
 * 10 % faster with it.
 */

/** f64 per layer: c3, c2, c1, c0, ym, band, then two unused (64 bytes, so a layer is at 64·i). */
export const WEDGE_STRIDE = 8;
/** Slack on the layer's ends for the rounding of x = hz·wn[i] and of the fast test. */
const END_SLACK = 1e-6;

export function buildWedgeTable(): Float64Array {
  const { wn } = ZIGGURAT_TABLES;
  const table = new Float64Array(128 * WEDGE_STRIDE);
  const edge = (i: number): number => (i === 0 ? 0 : wn[i]! * 2 ** 31);
  for (let i = 1; i < 128; i++) {
    const y0 = Math.max(0, edge(i - 1) ** 2 - END_SLACK);
    const y1 = edge(i) ** 2 + END_SLACK;
    const ym = (y0 + y1) / 2;
    const c0 = Math.exp(-ym / 2);
    const remainder = ((Math.exp(-y0 / 2) / 16) * ((y1 - y0) / 2) ** 4) / 24;
    table.set([-c0 / 48, c0 / 8, -c0 / 2, c0, ym, 2 * remainder + 1e-14], i * WEDGE_STRIDE);
  }
  return table;
}

/** Built once: the tables are constants. */
export const WEDGE_TABLE: Float64Array = buildWedgeTable();

/** The cubic of layer i at y = x·x, in the kernel's order of operations (for tests). */
export function wedgeCubic(table: Float64Array, i: number, x: number): number {
  const at = i * WEDGE_STRIDE;
  const d = x * x - table[at + 4]!;
  return ((table[at]! * d + table[at + 1]!) * d + table[at + 2]!) * d + table[at + 3]!;
}
