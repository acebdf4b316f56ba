import { KERNEL_CHOICES, type KernelChoice } from '../../shared/engine/wasm/kernel-choice';

/**
 * Command-line arguments of the headless runner:
 *   sheet run <file.json> [--workers N] [--paths-scale F]
 * A mistake here is a usage error (exit code 2), never a crash.
 */
export interface RunArguments {
  command: 'run';
  file: string;
  /** Worker threads; null = one per core. */
  workers: number | null;
  /** Multiplies every simulation's and study's path count (quick looks and tests). */
  pathsScale: number | null;
  /** Which simulation kernel: js, wasm (falls back when it cannot run) or auto (default). */
  kernel: KernelChoice;
}

/** `verify <file.json> --digests <digests.json>`: rerun the sheet and compare with saved digests. */
export interface VerifyArguments {
  command: 'verify';
  file: string;
  digests: string;
  workers: number | null;
  kernel: KernelChoice;
}

export interface HelpArguments {
  command: 'help';
}

export type CliArguments = RunArguments | VerifyArguments | HelpArguments;

export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

export const USAGE = `Usage: npm run --silent sheet -- run <file.json> [--workers N] [--paths-scale F] [--kernel K]
       npm run --silent sheet -- verify <file.json> --digests <digests.json> [--workers N] [--kernel K]

Validates the sheet, runs every simulation, probe and study cell, and prints one JSON
object { "title", "cells": [...] } on stdout.

  --workers N       worker threads to simulate on (default: one per core)
  --paths-scale F   multiply every path count by F (e.g. 0.1 for a quick look)
  --kernel K        the simulation kernel: auto (default: WebAssembly SIMD where it can run,
                    else JavaScript), wasm (the same, and each simulation says when it fell
                    back) or js. Both give the same numbers bit for bit.

Warnings (estimates conditional on surviving paths, an unstable step) go to stderr and into
the JSON of the cells concerned.

verify reruns every simulation and compares it with the saved digests: a version's
{ "engineVersion", "digests": { cellId: digest } } or the JSON an earlier "run" printed. Under
the same engine version the digests must be equal bit for bit; under another one, each state's
final mean and variance must agree within their Monte Carlo standard errors (needs the run JSON).
verify exits 0 when everything reproduces and 1 with a plain report when not.

Exit codes: 0 done, 1 invalid sheet (details on stderr) or a cell failed, 2 usage error,
3 a simulation lost every path (no estimates).`;

function positiveNumber(flag: string, text: string | undefined, integer: boolean): number {
  if (text === undefined || text.startsWith('--')) throw new UsageError(`${flag} needs a value`);
  const value = Number(text);
  if (!Number.isFinite(value) || value <= 0 || (integer && !Number.isInteger(value))) {
    throw new UsageError(`${flag} must be a positive ${integer ? 'whole number' : 'number'}, got "${text}"`);
  }
  return value;
}

export function parseArguments(argv: readonly string[]): CliArguments {
  const [command, ...rest] = argv;
  if (command === undefined || command === 'help' || command === '--help' || command === '-h')
    return { command: 'help' };
  if (command !== 'run' && command !== 'verify')
    throw new UsageError(`unknown command "${command}"; the commands are "run" and "verify"`);
  let file: string | undefined;
  let digests: string | undefined;
  let workers: number | null = null;
  let pathsScale: number | null = null;
  let kernel: KernelChoice = 'auto';
  for (let i = 0; i < rest.length; i++) {
    const arg = rest[i]!;
    const [flag, inline] =
      arg.startsWith('--') && arg.includes('=')
        ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)]
        : [arg, undefined];
    if (flag === '--workers') {
      workers = positiveNumber('--workers', inline ?? rest[++i], true);
      if (workers > 256) throw new UsageError('--workers is at most 256');
    } else if (flag === '--digests' && command === 'verify') {
      const value = inline ?? rest[++i];
      if (value === undefined || value.startsWith('--')) throw new UsageError('--digests needs a file');
      digests = value;
    } else if (flag === '--paths-scale' && command === 'run') {
      pathsScale = positiveNumber('--paths-scale', inline ?? rest[++i], false);
    } else if (flag === '--kernel') {
      const value = inline ?? rest[++i];
      if (!KERNEL_CHOICES.includes(value as KernelChoice))
        throw new UsageError(`--kernel must be js, wasm or auto, got "${value ?? ''}"`);
      kernel = value as KernelChoice;
    } else if (flag.startsWith('-')) {
      throw new UsageError(`unknown option "${flag}"`);
    } else if (file === undefined) {
      file = arg;
    } else {
      throw new UsageError(`only one sheet file, got "${file}" and "${arg}"`);
    }
  }
  if (file === undefined) throw new UsageError(`${command} needs a sheet file: ${command} <file.json>`);
  if (command === 'verify') {
    if (digests === undefined)
      throw new UsageError('verify needs the saved digests: --digests <digests.json>');
    return { command: 'verify', file, digests, workers, kernel };
  }
  return { command: 'run', file, workers, pathsScale, kernel };
}
