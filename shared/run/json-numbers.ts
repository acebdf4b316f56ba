/** JSON has no NaN or ±∞: such numbers are printed as null. */
export function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}
