import { describe, expect, it } from 'vitest';
import { validateSheetText } from '../../../server/cli/validate';
import { findExampleSheet } from '@shared/examples/index';

const soil = findExampleSheet('soil-moisture-anomaly')!.document;

function withCell(id: string, change: (cell: Record<string, unknown>) => void): string {
  const copy = structuredClone(soil) as unknown as { cells: Record<string, unknown>[] };
  change(copy.cells.find((cell) => cell.id === id)!);
  return JSON.stringify(copy);
}

describe('validateSheetText', () => {
  it('accepts an example sheet', () => {
    const outcome = validateSheetText(JSON.stringify(soil));
    expect(outcome.ok).toBe(true);
  });

  it('names the cell and the field of a schema error', () => {
    const outcome = validateSheetText(withCell('season-run', (cell) => (cell.paths = -5)));
    expect(outcome).toMatchObject({ ok: false });
    if (outcome.ok) return;
    expect(outcome.problems).toHaveLength(1);
    expect(outcome.problems[0]).toMatch(/^cell season-run, paths: /);
  });

  it('names the cell and the expression of a checker error', () => {
    const outcome = validateSheetText(
      withCell(
        'soil-model',
        (cell) => ((cell.states as Record<string, unknown>[])[0]!.drift = '-A / tau + rainfall'),
      ),
    );
    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.problems.join('\n')).toMatch(/cell soil-model, states\[0\]\.drift: .*rainfall/);
  });

  it('reports a cell without a usable id by its position', () => {
    const copy = structuredClone(soil) as unknown as { cells: Record<string, unknown>[] };
    copy.cells[0]!.id = 'has spaces';
    const outcome = validateSheetText(JSON.stringify(copy));
    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.problems[0]).toMatch(/^cell #1 \(no valid id\), id: /);
  });

  it('reports document-level problems and broken JSON without a cell', () => {
    const noTitle = validateSheetText(JSON.stringify({ ...soil, title: '   ' }));
    expect(noTitle.ok || noTitle.problems[0]).toMatch(/^sheet, title: a sheet needs a title/);
    const broken = validateSheetText('{"schemaVersion": 1,');
    expect(broken.ok || broken.problems[0]).toMatch(/^sheet: not valid JSON/);
  });
});
