import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { OU_PATHS, OU_STEPS } from './cases';

const run = promisify(execFile);

/**
 * The reference programs in the shared bench folder (a sibling of the repository in CI:
 * ../shared/bench from the repository root). Each is prepared once (compiled into a temporary
 * directory) and then measured in rounds alternating with the engine.
 */
export interface Reference {
  name: 'ref-c' | 'ref-c-ziggurat' | 'ref-numpy';
  /** One measurement: path-steps per second and seconds, as the program reports them. */
  measure(): Promise<{ seconds: number; stepsPerSec: number; mean: number; variance: number }>;
}

export interface ReferenceSetup {
  references: Reference[];
  skipped: { name: string; reason: string }[];
  cleanup(): void;
}

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..');

export function referenceFolder(): string {
  return process.env.MEANDER_BENCH_REFERENCES ?? resolve(repoRoot, '..', 'shared', 'bench');
}

async function commandWorks(command: string, args: string[]): Promise<boolean> {
  try {
    await run(command, args, { timeout: 30_000 });
    return true;
  } catch {
    return false;
  }
}

function parseReport(stdout: string): {
  seconds: number;
  stepsPerSec: number;
  mean: number;
  variance: number;
} {
  const line = stdout.trim().split('\n').pop() ?? '';
  const report = JSON.parse(line) as { seconds: number; stepsPerSec: number; mean: number; var: number };
  return {
    seconds: report.seconds,
    stepsPerSec: report.stepsPerSec,
    mean: report.mean,
    variance: report.var,
  };
}

export async function prepareReferences(): Promise<ReferenceSetup> {
  const folder = referenceFolder();
  const skipped: { name: string; reason: string }[] = [];
  const references: Reference[] = [];
  const buildDir = mkdtempSync(join(tmpdir(), 'meander-bench-'));
  const args = [String(OU_PATHS), String(OU_STEPS)];

  const hasGcc = await commandWorks('gcc', ['--version']);
  for (const [name, file] of [
    ['ref-c', 'em_ou.c'],
    ['ref-c-ziggurat', 'em_ou_zig.c'],
  ] as const) {
    const source = join(folder, file);
    if (!hasGcc) {
      skipped.push({ name, reason: 'gcc is not installed' });
    } else if (!existsSync(source)) {
      skipped.push({ name, reason: `${source} not found (set MEANDER_BENCH_REFERENCES to the folder)` });
    } else {
      const binary = join(buildDir, file.replace(/\.c$/, ''));
      try {
        await run('gcc', ['-O3', '-march=native', '-o', binary, source, '-lm'], { timeout: 120_000 });
        references.push({
          name,
          measure: async () => parseReport((await run(binary, args, { timeout: 600_000 })).stdout),
        });
      } catch (error) {
        skipped.push({
          name,
          reason: `gcc failed: ${error instanceof Error ? error.message : String(error)}`,
        });
      }
    }
  }

  const script = join(folder, 'em_ou_np.py');
  if (!existsSync(script)) {
    skipped.push({ name: 'ref-numpy', reason: `${script} not found` });
  } else if (!(await commandWorks('python3', ['-c', 'import numpy']))) {
    skipped.push({ name: 'ref-numpy', reason: 'python3 with numpy is not available' });
  } else {
    references.push({
      name: 'ref-numpy',
      measure: async () =>
        parseReport((await run('python3', [script, ...args], { timeout: 600_000 })).stdout),
    });
  }

  return { references, skipped, cleanup: () => rmSync(buildDir, { recursive: true, force: true }) };
}
