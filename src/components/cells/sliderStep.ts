/**
 * The step of a parameter's slider: a round number (1, 2 or 5 × 10^k) giving about 200 positions
 * that divides the range exactly, so the ends are reachable. When the value itself is not on that
 * grid the slider takes any value ('any'): a browser snaps a range input's value to its step, and
 * the slider must sit exactly at the parameter's value, never move it.
 */
export function sliderStep(min: number, max: number, value: number): number | 'any' {
  const span = max - min;
  if (!(span > 0) || !Number.isFinite(span)) return 'any';
  const wanted = span / 200;
  const power = 10 ** Math.floor(Math.log10(wanted));
  const step = Number(
    ([1, 2, 5, 10].map((m) => m * power).find((s) => s >= wanted) ?? wanted).toPrecision(12),
  );
  const onGrid = (offset: number) => {
    const ratio = offset / step;
    return Math.abs(ratio - Math.round(ratio)) < 1e-9 * Math.max(1, Math.abs(ratio));
  };
  return onGrid(span) && onGrid(value - min) ? step : 'any';
}
