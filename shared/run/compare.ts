import { ENGINE_VERSION } from '../engine/version';
import type { SimulationJson } from './output-json';

/**
 * "Rerun and compare": a saved version's simulations against a fresh run of the same document.
 * Under the same engine version the digests must be equal bit for bit (same sheet, same seed,
 * same engine: same numbers). Under another engine version they cannot be, so the final mean and
 * variance of each state are compared within their Monte Carlo standard errors instead, when
 * the saved record has them (a runner's JSON does; a version's digests alone do not).
 * One pure function, used by the sheet page and the command-line `verify`.
 */

export interface StateMoments {
  mean: number | null;
  variance: number | null;
}

/** What is known of one simulation's run: always its digest, sometimes its final statistics. */
export interface SimulationRecord {
  digest: string;
  engineVersion: number | null;
  /** Paths the final statistics are over (those not lost). */
  paths?: number;
  final?: Record<string, StateMoments>;
}

/** Differences within this many standard errors agree (common practice, no source). */
export const AGREEMENT_SE = 4;

export type CheckOutcome = 'reproduced' | 'differs' | 'agrees' | 'disagrees' | 'not-comparable' | 'not-rerun';

export interface SimulationCheck {
  cellId: string;
  outcome: CheckOutcome;
  /** In words: "reproduced bit for bit", "agrees within 2.1 SE", … */
  message: string;
  /** The largest difference in standard errors over the states' means and variances. */
  worstSE: number | null;
}

export interface RerunComparison {
  checks: SimulationCheck[];
  /** The saved digests were made by another engine version than the one that reran them. */
  engineChanged: boolean;
  savedEngineVersion: number | null;
  rerunEngineVersion: number;
  /** True when every saved simulation reproduced or agreed. */
  allGood: boolean;
}

/** The record of a simulation as the runner's JSON gives it. */
export function simulationRecord(json: SimulationJson): SimulationRecord {
  const final: Record<string, StateMoments> = {};
  for (const [name, summary] of Object.entries(json.final)) {
    final[name] = { mean: summary.mean, variance: summary.variance };
  }
  return {
    digest: json.digest,
    engineVersion: json.engineVersion,
    paths: json.paths - json.losses.count,
    final,
  };
}

/**
 * |a − b| in standard errors of the difference of two independent estimates. The mean's standard
 * error is √(s²/n); the sample variance's is s²·√(2/(n−1)) for normally distributed values
 * (from memory; the usual large-sample approximation, conservative for the same seed).
 */
function distanceInSE(a: number, b: number, seA: number, seB: number): number {
  const se = Math.sqrt(seA * seA + seB * seB);
  if (a === b) return 0;
  return se > 0 ? Math.abs(a - b) / se : Number.POSITIVE_INFINITY;
}

function worstDistance(saved: SimulationRecord, rerun: SimulationRecord): number | null {
  if (!saved.final || !rerun.final || !saved.paths || !rerun.paths) return null;
  let worst = 0;
  for (const [name, before] of Object.entries(saved.final)) {
    const after = rerun.final[name];
    if (!after || before.mean === null || before.variance === null) return null;
    if (after.mean === null || after.variance === null) return Number.POSITIVE_INFINITY;
    const [n1, n2] = [saved.paths, rerun.paths];
    const meanSE = (variance: number, n: number) => Math.sqrt(variance / n);
    const varianceSE = (variance: number, n: number) => variance * Math.sqrt(2 / Math.max(n - 1, 1));
    worst = Math.max(
      worst,
      distanceInSE(before.mean, after.mean, meanSE(before.variance, n1), meanSE(after.variance, n2)),
      distanceInSE(
        before.variance,
        after.variance,
        varianceSE(before.variance, n1),
        varianceSE(after.variance, n2),
      ),
    );
  }
  return worst;
}

function checkOne(
  cellId: string,
  saved: SimulationRecord,
  rerun: SimulationRecord | undefined,
  savedEngine: number | null,
  rerunEngine: number,
): SimulationCheck {
  if (!rerun) {
    return {
      cellId,
      outcome: 'not-rerun',
      message: 'was not rerun: the cell is gone or its run failed',
      worstSE: null,
    };
  }
  if (savedEngine === rerunEngine) {
    return saved.digest === rerun.digest
      ? { cellId, outcome: 'reproduced', message: 'reproduced bit for bit', worstSE: null }
      : {
          cellId,
          outcome: 'differs',
          message: `differs: digest ${rerun.digest}, saved ${saved.digest}`,
          worstSE: null,
        };
  }
  const worst = worstDistance(saved, rerun);
  if (worst === null) {
    return {
      cellId,
      outcome: 'not-comparable',
      message: 'cannot be compared: the saved record has no final means and variances',
      worstSE: null,
    };
  }
  const within = Number.isFinite(worst) ? worst.toFixed(1) : '∞';
  return worst <= AGREEMENT_SE
    ? { cellId, outcome: 'agrees', message: `agrees within ${within} SE`, worstSE: worst }
    : {
        cellId,
        outcome: 'disagrees',
        message: `disagrees: ${within} SE apart (more than ${AGREEMENT_SE})`,
        worstSE: worst,
      };
}

/** Compares every saved simulation with its rerun, in the saved records' order. */
export function compareRerun(
  saved: Readonly<Record<string, SimulationRecord>>,
  rerun: Readonly<Record<string, SimulationRecord>>,
  rerunEngineVersion: number = ENGINE_VERSION,
): RerunComparison {
  const savedEngineVersion = Object.values(saved)[0]?.engineVersion ?? null;
  const checks = Object.entries(saved).map(([cellId, record]) =>
    checkOne(cellId, record, rerun[cellId], record.engineVersion, rerunEngineVersion),
  );
  return {
    checks,
    engineChanged: savedEngineVersion !== null && savedEngineVersion !== rerunEngineVersion,
    savedEngineVersion,
    rerunEngineVersion,
    allGood: checks.every((check) => check.outcome === 'reproduced' || check.outcome === 'agrees'),
  };
}
