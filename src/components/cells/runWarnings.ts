import type { LossSummary } from '@shared/engine';

/**
 * The sentence every view of a run carries when the engine lost paths beyond its 1 % rule
 * (shared/engine/losses.ts): the numbers describe the survivors, not the model.
 */
export function conditionalWording(losses: LossSummary): string | null {
  if (losses.allLost) return 'No estimates: every path was lost.';
  if (!losses.conditional) return null;
  const survivors = (losses.paths - losses.count).toLocaleString('en');
  return `These estimates are conditional on the ${survivors} surviving paths: ${losses.count.toLocaleString('en')} of ${losses.paths.toLocaleString('en')} were lost, so they do not describe the model itself.`;
}
