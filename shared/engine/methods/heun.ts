import type { ModelSpec } from '../plan';
import { isZeroSource, renameStateAndTime, wrap, type StepSource } from './source-tools';

/**
 * Stochastic Heun scheme for Stratonovich models (Kloeden & Platen 1992, §11.1, eq. 11.1.10 with
 * the Euler predictor; Rümelin 1982): predictor Ȳ = Y + a(t_n, Y) h + b(t_n, Y) ΔW, corrector
 *   Y_{n+1} = Y + ½(a(t_n, Y) + a(t_{n+1}, Ȳ)) h + ½(b(t_n, Y) + b(t_{n+1}, Ȳ)) ΔW.
 * Converges to the Stratonovich solution; strong order 1 for scalar or commutative noise.
 */
export function heunStep(model: ModelSpec): StepSource {
  const d = model.stateNames.length;
  const m = model.noiseNames.length;
  const temporaries: string[] = [];
  const lines: string[] = [];
  const nonZero = (i: number, j: number): boolean => !isZeroSource(model.diffusion[i]![j]!);
  for (let i = 0; i < d; i++) {
    temporaries.push(`a${i}`, `u${i}`);
    lines.push(`a${i} = ${model.drift[i]!};`);
    for (let j = 0; j < m; j++) {
      if (!nonZero(i, j)) continue;
      temporaries.push(`b${i}_${j}`);
      lines.push(`b${i}_${j} = ${model.diffusion[i]![j]!};`);
    }
  }
  for (let i = 0; i < d; i++) {
    const noise = Array.from({ length: m }, (_, j) => j).filter((j) => nonZero(i, j));
    lines.push(`u${i} = s${i} + a${i} * h${noise.map((j) => ` + b${i}_${j} * dw${j}`).join('')};`);
  }
  for (let i = 0; i < d; i++) {
    const driftAtPredictor = wrap(renameStateAndTime(model.drift[i]!, 'u', 'tn'));
    const noise = Array.from({ length: m }, (_, j) => j).filter((j) => nonZero(i, j));
    const noiseTerms = noise.map(
      (j) =>
        ` + 0.5 * (b${i}_${j} + ${wrap(renameStateAndTime(model.diffusion[i]![j]!, 'u', 'tn'))}) * dw${j}`,
    );
    lines.push(`n${i} = s${i} + 0.5 * (a${i} + ${driftAtPredictor}) * h${noiseTerms.join('')};`);
  }
  return { temporaries, body: lines.join('\n') };
}
