/**
 * Caps on the size of a run. The sheet schema (shared/sheet/document.ts) takes its limits from
 * here, and the engine checks them again on the resolved counts (a step size resolves to a step
 * count), so no way of writing a sheet gets past them.
 *
 * Why these values: step indices live in Int32Array and in 32-bit bitwise expressions of the
 * generated kernel (see codegen.ts), which are exact below 2^31; path indices feed the per-path
 * stream seed as 32-bit integers. Both caps are far below 2^31, so every index is exact.
 */
export const MAX_STEPS = 10_000_000;
export const MAX_PATHS = 10_000_000;
