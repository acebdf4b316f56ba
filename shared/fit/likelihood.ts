/** What each likelihood (exact, Euler, simulated) gives the optimiser and the residual check. */
export interface Likelihood {
  /** Log-likelihood of every transition at the estimated values `theta`; −∞ where not defined. */
  logLikelihood(theta: Float64Array): number;
  /** Standardised one-step residuals at `theta` (each transition's innovation, whitened). */
  residuals(theta: Float64Array): Float64Array;
  /** How the residuals are computed, in words. */
  residualBasis: string;
}
