import type { ModelSpec } from '../plan';
import {
  isZeroSource,
  noiseShape,
  renameStateAndTime,
  statesMentioned,
  wrap,
  type StepSource,
} from './source-tools';

/**
 * Derivative-free Milstein scheme for scalar and diagonal noise (Kloeden & Platen 1992, §11.1,
 * eqs. 11.1.3 and 11.1.7 with the supporting value Ῡ = Y + a h + b √h):
 *   Y_{n+1} = Y_n + a h + b ΔW + (b(Ῡ) − b(Y_n)) (ΔW² − h) / (2√h).
 * Strong order 1 for Itô models whose noise is scalar, or diagonal with each b^{ii} depending on
 * its own state only (the condition under which no Lévy areas appear).
 */
export function checkMilstein(model: ModelSpec): void {
  const shape = noiseShape(model);
  if (shape === 'general') {
    throw new RangeError(
      'Milstein needs scalar noise (one noise source) or diagonal noise (one noise source per state, each state feeling only its own); use Euler–Maruyama for this model',
    );
  }
  if (shape === 'diagonal') {
    if (
      model.correlation !== null &&
      model.correlation.some((row, i) => row.some((c, j) => i !== j && c !== 0))
    ) {
      throw new RangeError(
        'Milstein with diagonal noise needs independent noise sources; use Euler–Maruyama for correlated noise',
      );
    }
    model.diffusion.forEach((row, i) => {
      const others = statesMentioned(row[i]!).filter((k) => k !== i);
      if (others.length > 0) {
        throw new RangeError(
          `Milstein with diagonal noise needs each diffusion to depend on its own state only; the diffusion of ${model.stateNames[i]} uses ${others.map((k) => model.stateNames[k]).join(', ')}`,
        );
      }
    });
  }
}

export function milsteinStep(model: ModelSpec): StepSource {
  checkMilstein(model);
  const d = model.stateNames.length;
  const shape = noiseShape(model);
  const temporaries: string[] = [];
  const lines: string[] = [];
  // Drift and diffusion at Y_n, then the supporting values Ῡ (u0…), then the update.
  const noiseOf = (i: number): number => (shape === 'scalar' ? 0 : i);
  for (let i = 0; i < d; i++) {
    temporaries.push(`a${i}`, `b${i}`, `u${i}`);
    lines.push(`a${i} = ${model.drift[i]!};`);
    lines.push(shape === 'none' ? `b${i} = 0;` : `b${i} = ${model.diffusion[i]![noiseOf(i)]!};`);
  }
  if (shape === 'none') {
    for (let i = 0; i < d; i++) lines.push(`n${i} = s${i} + a${i} * h;`);
    return { temporaries, body: lines.join('\n') };
  }
  for (let i = 0; i < d; i++) lines.push(`u${i} = s${i} + a${i} * h + b${i} * sqh;`);
  for (let i = 0; i < d; i++) {
    const source = model.diffusion[i]![noiseOf(i)]!;
    const j = noiseOf(i);
    if (isZeroSource(source)) {
      lines.push(`n${i} = s${i} + a${i} * h;`);
    } else {
      const atSupport = wrap(renameStateAndTime(source, 'u', 't'));
      lines.push(
        `n${i} = s${i} + a${i} * h + b${i} * dw${j} + (${atSupport} - b${i}) * (dw${j} * dw${j} - h) * halfInvSqh;`,
      );
    }
  }
  return { temporaries, body: lines.join('\n') };
}
