import { Fnv1a64 } from './digest';
import type { SavedStats } from './result';

/**
 * The digest of a run: FNV-1a 64 over every number the run reports, in this order (each array
 * in path order, so the digest does not depend on how paths were split into chunks or workers):
 *   paths, lost paths, saved times;
 *   per state: mean, variance, q05, q25, q50, q75, q95, min, max, live at each saved time,
 *     then every path's value at every saved time (which includes the final values);
 *   the covariance matrices at the saved times (models with several states);
 *   per probe time, per state: every path's value;
 *   per state: every path's running maximum, then running minimum;
 *   per watch: every path's first-passage time;
 *   per state: every path's absorption time;
 *   every path's loss time, then its loss cause.
 * NaN (no value) hashes as one canonical NaN.
 */
export interface DigestParts {
  paths: number;
  lostCount: number;
  savedTimes: Float64Array;
  stats: SavedStats[];
  savedValues: Float64Array[];
  covariance: Float64Array | null;
  probeValues: Float64Array[][];
  runningMax: Float64Array[];
  runningMin: Float64Array[];
  firstPassage: Float64Array[];
  absorptionTime: Float64Array[];
  lossTime: Float64Array;
  lossCause: Uint8Array;
}

export function runDigest(parts: DigestParts): string {
  const digest = new Fnv1a64().addNumber(parts.paths).addNumber(parts.lostCount).addNumbers(parts.savedTimes);
  parts.stats.forEach((s, i) => {
    for (const column of [s.mean, s.variance, s.q05, s.q25, s.q50, s.q75, s.q95, s.min, s.max, s.live])
      digest.addNumbers(column);
    digest.addNumbers(parts.savedValues[i]!);
  });
  if (parts.covariance !== null) digest.addNumbers(parts.covariance);
  for (const probe of parts.probeValues) for (const values of probe) digest.addNumbers(values);
  for (const values of parts.runningMax) digest.addNumbers(values);
  for (const values of parts.runningMin) digest.addNumbers(values);
  for (const values of parts.firstPassage) digest.addNumbers(values);
  for (const values of parts.absorptionTime) digest.addNumbers(values);
  digest.addNumbers(parts.lossTime).addNumbers(parts.lossCause);
  return digest.hex();
}
