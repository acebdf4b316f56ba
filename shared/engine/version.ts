/**
 * The engine's version, recorded beside every digest a run makes.
 *
 * The rule: raise it whenever the same sheet with the same seed may give different numbers than
 * before (a change to a scheme, the random streams, the normal sampler, the order of operations
 * in generated code, statistics, probes or what the digest covers). Changes that leave every
 * number bit-identical (speed, messages, layout) keep it. A rerun of an old version compares
 * digests bit for bit only when the engine version is the same; otherwise it compares estimates
 * within their Monte Carlo errors.
 */
export const ENGINE_VERSION = 4;
// 2: the digest covers every reported number (saved values, probe-time values, extremes, passages,
//    absorptions, losses and their causes, covariances); losses by cause; covariance statistics.
// 4: sheets no longer keep running extremes (no cell reads them; probes of hitting a level watch
//    it), so those per-path numbers are NaN in the digest. Every other number is unchanged.
