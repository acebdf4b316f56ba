import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ENGINE_VERSION } from '@shared/engine/version';
import { createTestContext, signUp, type SignedUpUser, type TestContext } from './helpers';

/**
 * Sheet files: a version out as one JSON file with its datasets, digests and engine version; the
 * same file in as a new sheet with fresh copies of the data; a bad file refused with the path of
 * its first fault and nothing created.
 */

let context: TestContext;
let owner: SignedUpUser;
let colleague: SignedUpUser;
let sheetId: string;
let file: Record<string, unknown> & { datasets: { id: string; content: string; checksum: string }[] };

/** Invented: soil moisture anomaly read at a field station. */
const CSV = 'day,anomaly\n0,0.5\n2,0.31\n5,-0.02\n9,0.12\n';

function documentWith(dataset: { id: string; checksum: string; name: string }) {
  return {
    schemaVersion: 1,
    title: 'Field station moisture',
    cells: [
      { id: 'p', kind: 'params', params: [{ name: 'r', value: 0.4 }] },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'A', initial: '0.5', drift: '-r * A', diffusion: { W: '0.1' } }],
        noises: [{ name: 'W' }],
      },
      { id: 'run', kind: 'simulation', model: 'm', t1: 10, steps: 100, paths: 200, seed: 3 },
      {
        id: 'obs',
        kind: 'data',
        dataset,
        model: 'm',
        timeColumn: 'day',
        columns: [{ column: 'anomaly', state: 'A', unit: 'vol. %' }],
      },
    ],
  };
}

async function count(table: 'sheets' | 'datasets'): Promise<number> {
  const result = await context.database.db.execute(sql.raw(`select count(*)::int as n from ${table}`));
  return Number(result.rows[0]!.n);
}

const importFile = (user: SignedUpUser, content: string | Buffer) =>
  user.agent
    .post('/api/sheets/import')
    .attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content), 'sheet.meander.json');

beforeAll(async () => {
  context = await createTestContext();
  owner = await signUp(context, { name: 'File owner' });
  colleague = await signUp(context, { name: 'File colleague' });
  const created = await owner.agent.post('/api/sheets').send({ title: 'Field station moisture' }).expect(201);
  sheetId = created.body.id as string;
  const uploaded = await owner.agent
    .post(`/api/sheets/${sheetId}/datasets`)
    .field('name', 'station readings')
    .attach('file', Buffer.from(CSV), 'station.csv')
    .expect(201);
  const dataset = { id: uploaded.body.id, checksum: uploaded.body.checksum, name: 'station readings' };
  await owner.agent
    .post(`/api/sheets/${sheetId}/versions`)
    .send({
      baseVersion: 1,
      message: 'observations',
      document: documentWith(dataset),
      digests: { run: 'd'.repeat(64) },
      engineVersion: ENGINE_VERSION,
    })
    .expect(201);
  const exported = await owner.agent.get(`/api/sheets/${sheetId}/versions/2/file`).expect(200);
  file = exported.body;
});
afterAll(async () => {
  await context.close();
});

describe('exporting a version as a sheet file', () => {
  it('holds the document with its schema number, the data it uses, the digests and the engine version', () => {
    expect(file).toMatchObject({
      format: 'meander.sheet',
      formatVersion: 1,
      engineVersion: ENGINE_VERSION,
      source: { sheetId, version: 2, title: 'Field station moisture' },
      document: { schemaVersion: 1, title: 'Field station moisture' },
      digests: { run: 'd'.repeat(64) },
      digestsEngineVersion: ENGINE_VERSION,
    });
    expect(file.datasets).toEqual([expect.objectContaining({ name: 'station readings', content: CSV })]);
  });

  it('answers a stranger 404', async () => {
    await colleague.agent.get(`/api/sheets/${sheetId}/versions/2/file`).expect(404);
  });
});

describe('importing a sheet file', () => {
  it('makes a new sheet for the importer, with its own copy of the data under a new id', async () => {
    const response = await importFile(colleague, JSON.stringify(file));
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const sheet = await colleague.agent.get(`/api/sheets/${response.body.id}`).expect(200);
    const cell = sheet.body.document.cells.find((c: { id: string }) => c.id === 'obs');
    expect(cell.dataset.id).not.toBe(file.datasets[0]!.id);
    expect(cell.dataset.checksum).toBe(file.datasets[0]!.checksum);
    const table = await colleague.agent.get(`/api/datasets/${cell.dataset.id}`).expect(200);
    expect(table.body.rows).toEqual([
      [0, 0.5],
      [2, 0.31],
      [5, -0.02],
      [9, 0.12],
    ]);
    // The original data stays private to the original sheet.
    await colleague.agent.get(`/api/datasets/${file.datasets[0]!.id}`).expect(404);
  });

  /** The parts of an exported file the spoilers below change. */
  type Spoilable = {
    format: string;
    document: { schemaVersion: number; cells: Record<string, unknown>[] };
    datasets: { content: string }[];
  };
  const BAD: [string, (copy: Spoilable) => unknown, RegExp][] = [
    [
      'a document with a bad field',
      (copy) => ((copy.document.cells[2]!.steps = -5), copy),
      /^document\.cells\.2\.steps: /,
    ],
    ['another format', (copy) => ((copy.format = 'spreadsheet'), copy), /^format: not a Meander sheet file/],
    [
      'a dataset changed after export',
      (copy) => ((copy.datasets[0]!.content = CSV.replace('0.31', '0.35')), copy),
      /^datasets\.0\.checksum: the content of dataset 'station readings' does not match its checksum/,
    ],
    [
      'a data cell whose dataset is not in the file',
      (copy) => ((copy.datasets = []), copy),
      /^document\.cells\.3\.dataset: data cell 'obs' uses dataset 'station readings', which the file does not hold/,
    ],
    [
      'a newer sheet format',
      (copy) => ((copy.document.schemaVersion = 99), copy),
      /^document\.schemaVersion: this sheet was written in format 99/,
    ],
  ];

  it.each(BAD)(
    'refuses %s with 400 and the path of the fault, creating nothing',
    async (_what, spoil, message) => {
      const before = [await count('sheets'), await count('datasets')];
      const response = await importFile(
        colleague,
        JSON.stringify(spoil(structuredClone(file) as unknown as Spoilable)),
      );
      expect(response.status, JSON.stringify(response.body)).toBe(400);
      expect(response.body.error.code).toBe('sheet_files.invalid');
      expect(response.body.error.message).toMatch(message);
      expect(response.body.error.message).toMatch(/no sheet was created\.$/);
      expect([await count('sheets'), await count('datasets')]).toEqual(before);
    },
  );

  it('refuses a file that is not JSON', async () => {
    const response = await importFile(colleague, 'day,anomaly\n0,1\n');
    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/not UTF-8 JSON/);
  });

  it('never reported an unexpected error', () => {
    expect(context.reported).toEqual([]);
  });
});
