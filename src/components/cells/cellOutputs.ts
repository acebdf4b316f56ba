import type { CellOutput } from './contract';

/** The message of a cell's failed run, or null. */
export function runErrorOf(outputs: Record<string, CellOutput | undefined>, cellId: string): string | null {
  const output = outputs[cellId];
  return output?.kind === 'error' ? output.message : null;
}
