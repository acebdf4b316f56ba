import { simulationCellSchema } from '@shared/cells/simulation';
import { parseIntegerText, parseNumberText } from './numberText';
import { numberRange } from '@/composables/schemaLimits';

/** Checks for the number fields of a simulation cell; ranges are read from the cell's schema. */

const fields = simulationCellSchema.shape;
export const STEPS_RANGE = numberRange(fields.steps);
export const PATHS_RANGE = numberRange(fields.paths);
export const SEED_RANGE = numberRange(fields.seed);
export const SAVE_COUNT_RANGE = numberRange(fields.saveCount);
export const SAMPLE_PATHS_RANGE = numberRange(fields.samplePaths);

export function integerCheck(what: string, range: { min: number; max: number }) {
  return (text: string): string | null => {
    const parsed = parseIntegerText(text, what, range);
    return parsed.ok ? null : parsed.message;
  };
}

export function numberCheck(what: string, extra?: (value: number) => string | null) {
  return (text: string): string | null => {
    const parsed = parseNumberText(text, what);
    if (!parsed.ok) return parsed.message;
    return extra ? extra(parsed.value) : null;
  };
}

export const positive = (what: string) => (value: number) => (value > 0 ? null : `${what} must be above 0.`);

/** Blank means "not set" for optional numbers. */
export function optionalNumberCheck(what: string, extra?: (value: number) => string | null) {
  const check = numberCheck(what, extra);
  return (text: string): string | null => (text.trim() === '' ? null : check(text));
}

export function toNumber(text: string): number {
  const parsed = parseNumberText(text);
  return parsed.ok ? parsed.value : Number.NaN;
}

/** A new seed for "New seed": random, within the schema's 32-bit range. */
export function freshSeed(random: () => number = Math.random): number {
  return Math.floor(random() * 0x1_0000_0000) >>> 0;
}
