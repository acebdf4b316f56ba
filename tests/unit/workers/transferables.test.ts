import { describe, expect, it } from 'vitest';
import { collectTransferables } from '@shared/run/transferables';
import { chunkTransferables } from '@shared/run/chunk-task';
import { simulateChunk } from '@shared/engine/simulate';
import { buildSimulationPlan, sheetDocumentSchema } from '@shared/sheet/index';
import { readFileSync } from 'node:fs';

describe('collectTransferables', () => {
  it('finds each buffer once, through nested arrays and objects, and skips shared memory', () => {
    const big = new Float64Array(8);
    const value = {
      a: big,
      views: [big.subarray(2, 4), new Int32Array(3)],
      nested: { deeper: [[new Float64Array(2)]] },
      shared: new Int32Array(new SharedArrayBuffer(4)),
      empty: new Float64Array(0),
      label: 'not a buffer',
    };
    const buffers = collectTransferables(value);
    expect(buffers).toHaveLength(3);
    expect(buffers).toContain(big.buffer);
  });

  it('lists every array of an engine chunk so posting it copies nothing', () => {
    const doc = sheetDocumentSchema.parse(
      JSON.parse(readFileSync(new URL('../runner/fixtures/small-relaxation.json', import.meta.url), 'utf8')),
    );
    const chunk = simulateChunk(buildSimulationPlan(doc, 'gauge-run'), 0, 10);
    const buffers = chunkTransferables(chunk);
    const arrays = Object.values(chunk).filter(
      (v): v is Float64Array => ArrayBuffer.isView(v) && v.byteLength > 0,
    );
    for (const array of arrays) expect(buffers).toContain(array.buffer);
    // Transferring detaches them: structuredClone with a transfer list moves, not copies.
    const moved = structuredClone(chunk, { transfer: buffers });
    expect(moved.saved.length).toBeGreaterThan(0);
    expect(chunk.saved.length).toBe(0);
  });
});
