import { createHash } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DATASET_LIMITS } from '@shared/api/datasets';
import { createTestContext, signUp, type SignedUpUser, type TestContext } from './helpers';

/**
 * Uploading observed data: every bad file the data issue names is refused with its row and
 * column (400) or its limit (413), and nothing is stored; rights as the rights table says; the
 * stored checksum is the SHA-256 of the bytes sent.
 */

let context: TestContext;
let owner: SignedUpUser;
let editor: SignedUpUser;
let viewer: SignedUpUser;
let stranger: SignedUpUser;
let sheetId: string;

/** Invented counts of a wading bird at two estuary sites. */
const GOOD_CSV = [
  'day,site,birds,depth',
  '0,north,41,1.2',
  '3,north,38,',
  '7,north,45,1.1',
  '0,south,12,0.8',
  '5,south,15,0.9',
].join('\n');

beforeAll(async () => {
  context = await createTestContext();
  owner = await signUp(context, { name: 'Dataset owner' });
  editor = await signUp(context, { name: 'Dataset editor' });
  viewer = await signUp(context, { name: 'Dataset viewer' });
  stranger = await signUp(context, { name: 'Dataset stranger' });
  const created = await owner.agent.post('/api/sheets').send({ title: 'Estuary birds' }).expect(201);
  sheetId = created.body.id as string;
  for (const [user, role] of [
    [editor, 'editor'],
    [viewer, 'viewer'],
  ] as const) {
    await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email: user.email, role }).expect(201);
  }
});
afterAll(async () => {
  await context.close();
});

function upload(
  user: SignedUpUser,
  content: string | Buffer,
  fields: Record<string, string> = {},
  filename = 'birds.csv',
) {
  let request = user.agent.post(`/api/sheets/${sheetId}/datasets`);
  for (const [key, value] of Object.entries(fields)) request = request.field(key, value);
  return request.attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), filename);
}

async function datasetCount(): Promise<number> {
  const result = await context.database.db.execute(sql`select count(*)::int as n from datasets`);
  return Number(result.rows[0]!.n);
}

describe('uploading a dataset', () => {
  it('stores a good file and answers 201 with its columns, row count and SHA-256', async () => {
    const response = await upload(editor, GOOD_CSV, { name: 'Estuary counts', groupColumn: 'site' });
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body).toMatchObject({
      name: 'Estuary counts',
      rowCount: 5,
      columns: [
        { name: 'day', type: 'number' },
        { name: 'site', type: 'text' },
        { name: 'birds', type: 'number' },
        { name: 'depth', type: 'number' },
      ],
      checksum: createHash('sha256').update(GOOD_CSV).digest('hex'),
    });
    const table = await viewer.agent.get(`/api/datasets/${response.body.id}`).expect(200);
    expect(table.body.rows[1]).toEqual([3, 'north', 38, null]);
    const file = await viewer.agent.get(`/api/datasets/${response.body.id}/csv`).expect(200);
    expect(file.text).toBe(GOOD_CSV);
    expect(file.headers['content-type']).toMatch(/^text\/csv/);
  });

  it('reads a tab-separated file with a UTF-8 byte-order mark', async () => {
    const tsv = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('t\tlevel\n0\t1.5\n1\t1.7\n')]);
    const response = await upload(editor, tsv, {}, 'levels.tsv');
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body.columns.map((c: { name: string }) => c.name)).toEqual(['t', 'level']);
    expect(response.body.name).toBe('levels');
  });

  const BAD_FILES: {
    what: string;
    content: string | Buffer;
    fields?: Record<string, string>;
    message: RegExp;
    row?: number;
    column?: string;
  }[] = [
    {
      what: 'a value that is not a number',
      content: 'day,birds\n0,41\n1,n/a\n2,44\n',
      message: /row 3, column birds: 'n\/a' is not a number; leave the cell empty for a missing value/,
      row: 3,
      column: 'birds',
    },
    {
      what: 'times out of order',
      content: 'day,birds\n0,41\n5,40\n3,44\n',
      message: /row 4, column day: time 3 comes after 5/,
      row: 4,
      column: 'day',
    },
    {
      what: 'a time twice within a group',
      content: 'day,site,birds\n0,north,41\n0,south,12\n2,north,40\n2,north,44\n',
      fields: { groupColumn: 'site' },
      message: /row 5, column day: time 2 appears twice in group 'north'/,
      row: 5,
      column: 'day',
    },
    {
      what: 'a missing time',
      content: 'day,birds\n0,41\n,40\n',
      message: /row 3, column day: the time is missing/,
      row: 3,
      column: 'day',
    },
    {
      what: 'a row with too few columns',
      content: 'day,birds,depth\n0,41,1.2\n1,40\n',
      message: /row 3 has 2 columns, the header has 3/,
      row: 3,
    },
    {
      what: 'a file that is not delimited text',
      content: '{"observations": [1, 2, 3]}\n',
      message: /not delimited text/,
      row: 1,
    },
    {
      what: 'a binary file',
      content: Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00]),
      message: /not delimited text \(it holds binary data\)/,
    },
    {
      what: 'a file in Latin-1 rather than UTF-8',
      content: Buffer.from('jour,d\xe9bit\n0,1.5\n', 'latin1'),
      message: /encoding is wrong \(it is not valid UTF-8\)/,
    },
    {
      what: 'a UTF-16 file',
      content: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('day,birds\n0,41\n', 'utf16le')]),
      message: /encoding is wrong \(it is UTF-16\)/,
    },
    { what: 'an empty file', content: '', message: /the file is empty/ },
    { what: 'a file of blank lines', content: '\n\n  \n', message: /the file is empty/ },
    {
      what: 'a header with a blank column name',
      content: 'day,,depth\n0,41,1.2\n',
      message: /row 1: column 2 has no name/,
      row: 1,
    },
    {
      what: 'a time column the file does not have',
      content: 'day,birds\n0,41\n',
      fields: { timeColumn: 'hour' },
      message: /no column 'hour' for the time/,
      column: 'hour',
    },
  ];

  it.each(BAD_FILES.map((bad) => [bad.what, bad]))(
    'refuses %s with 400, row and column, and stores nothing',
    async (_what, bad) => {
      const before = await datasetCount();
      const response = await upload(editor, bad.content, bad.fields ?? {});
      expect(response.status, JSON.stringify(response.body)).toBe(400);
      expect(response.body.error.code).toBe('datasets.bad_file');
      expect(response.body.error.message).toMatch(bad.message);
      expect(response.body.error.message).toMatch(/nothing was stored\.$/);
      if (bad.row !== undefined) expect(response.body.error.row).toBe(bad.row);
      if (bad.column !== undefined) expect(response.body.error.column).toBe(bad.column);
      expect(await datasetCount()).toBe(before);
    },
  );

  it('refuses a file over 10 MB with 413 naming the limit, and stores nothing', async () => {
    const before = await datasetCount();
    const line = '1,2\n';
    const big = 't,x\n' + line.repeat(Math.ceil((DATASET_LIMITS.maxBytes + 10) / line.length));
    const response = await upload(editor, big);
    expect(response.status).toBe(413);
    expect(response.body.error).toMatchObject({ code: 'datasets.too_large', limit: DATASET_LIMITS.maxBytes });
    expect(response.body.error.message).toMatch(/larger than 10 MB/);
    expect(await datasetCount()).toBe(before);
  });

  it('refuses a file of more than 200,000 rows with 413 naming the limit, and stores nothing', async () => {
    const before = await datasetCount();
    const rows = Array.from({ length: DATASET_LIMITS.maxRows + 1 }, (_, i) => `${i},1`);
    const response = await upload(editor, ['t,x', ...rows].join('\n'));
    expect(response.status).toBe(413);
    expect(response.body.error).toMatchObject({ code: 'datasets.too_large', limit: DATASET_LIMITS.maxRows });
    expect(response.body.error.message).toMatch(/200,001 data rows; at most 200,000/);
    expect(await datasetCount()).toBe(before);
  });

  it('asks for the file when the form has none', async () => {
    const response = await editor.agent.post(`/api/sheets/${sheetId}/datasets`).field('name', 'x');
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('datasets.no_file');
  });
});

describe('who may upload and read datasets', () => {
  let datasetId: string;
  beforeAll(async () => {
    const response = await upload(owner, GOOD_CSV, { groupColumn: 'site' }).expect(201);
    datasetId = response.body.id as string;
  });

  it('refuses a viewer 403 and a stranger 404, storing nothing', async () => {
    const before = await datasetCount();
    const byViewer = await upload(viewer, GOOD_CSV);
    expect(byViewer.status).toBe(403);
    expect(byViewer.body.error.code).toBe('sheets.forbidden');
    const byStranger = await upload(stranger, GOOD_CSV);
    expect(byStranger.status).toBe(404);
    expect(await datasetCount()).toBe(before);
  });

  it('lets every reader of the sheet read it and answers 404 to a stranger', async () => {
    for (const user of [owner, editor, viewer]) {
      await user.agent.get(`/api/datasets/${datasetId}`).expect(200);
    }
    const table = await stranger.agent.get(`/api/datasets/${datasetId}`);
    expect(table.status).toBe(404);
    expect(table.body.error.code).toBe('datasets.not_found');
    await stranger.agent.get(`/api/datasets/${datasetId}/csv`).expect(404);
    await stranger.agent.get('/api/datasets/not-an-id!').expect(404);
  });

  it('lets a fork keep reading the data of the sheet it was forked from', async () => {
    // The stranger is made a viewer, forks, and then loses the share: the fork still reads.
    await owner.agent
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: stranger.email, role: 'viewer' })
      .expect(201);
    const fork = await stranger.agent.post(`/api/sheets/${sheetId}/forks`).send({}).expect(201);
    await owner.agent.delete(`/api/sheets/${sheetId}/shares/${stranger.id}`).expect(204);
    await stranger.agent.get(`/api/datasets/${datasetId}`).expect(200);
    // A fork of the fork reads it too; deleting the fork ends that.
    await stranger.agent.delete(`/api/sheets/${fork.body.id}`).expect(204);
    await stranger.agent.get(`/api/datasets/${datasetId}`).expect(404);
  });

  it('keeps the SHA-256 of the bytes sent, which the parsed table repeats', async () => {
    const table = await owner.agent.get(`/api/datasets/${datasetId}`).expect(200);
    expect(table.body.checksum).toBe(createHash('sha256').update(GOOD_CSV).digest('hex'));
    const file = await owner.agent.get(`/api/datasets/${datasetId}/csv`).expect(200);
    expect(createHash('sha256').update(file.text).digest('hex')).toBe(table.body.checksum);
  });

  it('never reported an unexpected error', () => {
    expect(context.reported).toEqual([]);
  });
});
