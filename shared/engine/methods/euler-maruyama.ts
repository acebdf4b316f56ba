import type { ModelSpec } from '../plan';
import { isZeroSource, wrap, type StepSource } from './source-tools';

/**
 * Euler–Maruyama (Kloeden & Platen 1992, §9.1, eq. 9.1.2):
 *   Y_{n+1} = Y_n + a(t_n, Y_n) h + Σ_j b^j(t_n, Y_n) ΔW^j.
 * Strong order 1/2, weak order 1 for Itô models.
 */
export function eulerMaruyamaStep(model: ModelSpec): StepSource {
  const d = model.stateNames.length;
  const lines: string[] = [];
  for (let i = 0; i < d; i++) {
    const terms = [`${wrap(model.drift[i]!)} * h`];
    model.diffusion[i]!.forEach((source, j) => {
      if (!isZeroSource(source)) terms.push(`${wrap(source)} * dw${j}`);
    });
    lines.push(`n${i} = s${i} + ${terms.join(' + ')};`);
  }
  return { temporaries: [], body: lines.join('\n') };
}
