import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

/** The headless runner reading a Meander sheet file: the document with its datasets. */
const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));
const demoFile = path.join(repoRoot, 'shared/examples/sheet-files/pond-oxygen.meander.json');

function runCli(args: string[]): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['node_modules/tsx/dist/cli.mjs', 'server/cli.ts', ...args], {
      cwd: repoRoot,
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

describe('running a sheet file from the command line', () => {
  it('runs the data cell from the embedded dataset', async () => {
    const run = await runCli(['run', demoFile, '--workers', '1', '--paths-scale', '0.1']);
    expect(run.code, run.stderr).toBe(0);
    const output = JSON.parse(run.stdout) as { cells: { id: string; kind: string; groups?: number }[] };
    expect(output.cells.find((cell) => cell.id === 'pond-observed')).toMatchObject({
      kind: 'data',
      groups: 2,
    });
  });

  it('fits the demo data and recovers the values they were generated with, within the intervals', async () => {
    const run = await runCli(['run', demoFile, '--workers', '1', '--paths-scale', '0.1']);
    expect(run.code, run.stderr).toBe(0);
    const output = JSON.parse(run.stdout) as {
      cells: {
        id: string;
        kind: string;
        converged?: boolean;
        estimates?: { name: string; ci: number[] }[];
      }[];
    };
    const fit = output.cells.find((cell) => cell.id === 'pond-fit');
    expect(fit?.converged).toBe(true);
    // True values of the invented data (scripts/pond-oxygen-data.ts): κ 0.35, μ 2.4, σ 0.55.
    const truth: Record<string, number> = { kappa: 0.35, mu: 2.4, sigma: 0.55 };
    for (const estimate of fit?.estimates ?? []) {
      const [low, high] = estimate.ci;
      expect(low).toBeLessThan(truth[estimate.name]!);
      expect(high).toBeGreaterThan(truth[estimate.name]!);
    }
    expect(fit?.estimates?.map((e) => e.name)).toEqual(['kappa', 'mu', 'sigma']);
  });

  it('refuses a file whose dataset was changed after export, naming the place', async () => {
    const file = JSON.parse(readFileSync(demoFile, 'utf8'));
    file.datasets[0].content = file.datasets[0].content.replace('5.100', '5.200');
    const dir = mkdtempSync(path.join(os.tmpdir(), 'meander-sheet-file-'));
    const spoilt = path.join(dir, 'spoilt.meander.json');
    writeFileSync(spoilt, JSON.stringify(file));
    const run = await runCli(['run', spoilt, '--workers', '1']);
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(
      /datasets\[0\]\.checksum: the content of dataset .* does not match its checksum/,
    );
  });
});
