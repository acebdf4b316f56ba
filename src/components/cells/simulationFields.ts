import { parseIntegerText, parseNumberText } from './numberText';

/** Checks for the number fields of a simulation cell; ranges follow the sheet schema. */

export const STEPS_RANGE = { min: 1, max: 10_000_000 };
export const PATHS_RANGE = { min: 1, max: 10_000_000 };
export const SEED_RANGE = { min: 0, max: 0xffffffff };
export const SAVE_COUNT_RANGE = { min: 2, max: 10_001 };
export const SAMPLE_PATHS_RANGE = { min: 0, max: 1000 };

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
