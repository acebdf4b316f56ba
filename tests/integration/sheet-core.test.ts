import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ENGINE_VERSION } from '@shared/engine/version';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import { summariseResults } from '@shared/run/version-results';
import { sheetCellDependencies, sheetFingerprints } from '@shared/sheet';
import { parseSheetDocument } from '@shared/sheet/upgrade';
import { createTestContext, signUp, type SignedUpUser, type TestContext } from './helpers';

let context: TestContext;
let modeller: SignedUpUser;
let stranger: SignedUpUser;

beforeAll(async () => {
  context = await createTestContext();
  modeller = await signUp(context, { name: 'Ilse Brandvold' });
  stranger = await signUp(context, { name: 'Kofi Mensah-Laar' });
});
afterAll(async () => {
  await context.close();
});

/** An invented model: groundwater head relaxing towards a recharge level under noisy rainfall. */
function aquiferDocument(title: string, volatility = 0.25) {
  return {
    schemaVersion: 1,
    title,
    cells: [
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'a', value: 0.4 },
          { name: 's', value: volatility },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'H', initial: '2', drift: 'a * (3 - H)', diffusion: { R: 's' } }],
        noises: [{ name: 'R' }],
      },
      { id: 'run', kind: 'simulation', model: 'm', t1: 10, steps: 100, paths: 200, seed: 91 },
    ],
  };
}

async function createSheet(user: SignedUpUser, title: string, extra: Record<string, unknown> = {}) {
  const response = await user.agent
    .post('/api/sheets')
    .send({ title, document: aquiferDocument(title), ...extra });
  return response;
}

async function sheetCount(): Promise<number> {
  const result = await context.database.db.execute(sql`select count(*)::int as n from sheets`);
  return Number(result.rows[0]?.n);
}

describe('digests carry the engine version that made them', () => {
  it('stores the engine version the client names with the digests', async () => {
    const created = (await createSheet(modeller, 'Aquifer head')).body;
    const save = await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Ran it',
      document: aquiferDocument('Aquifer head'),
      digests: { run: 'c0ffee01' },
      engineVersion: 1,
    });
    expect(save.status).toBe(201);
    const sheet = await modeller.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.body).toMatchObject({ digests: { run: 'c0ffee01' }, engineVersion: 1 });
    const version = await modeller.agent.get(`/api/sheets/${created.id}/versions/2`);
    expect(version.body).toMatchObject({ digests: { run: 'c0ffee01' }, engineVersion: 1 });
  });

  it("records the server's engine version for digests sent without one", async () => {
    const created = (await createSheet(modeller, 'Aquifer legacy client')).body;
    await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Ran it',
      document: aquiferDocument('Aquifer legacy client'),
      digests: { run: 'c0ffee02' },
    });
    const version = await modeller.agent.get(`/api/sheets/${created.id}/versions/2`);
    expect(version.body.engineVersion).toBe(ENGINE_VERSION);
  });

  it('has no engine version for a version without digests', async () => {
    const created = (await createSheet(modeller, 'Aquifer unrun')).body;
    const sheet = await modeller.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.body).toMatchObject({ digests: {}, engineVersion: null });
  });

  it('rejects an engine version this server does not know with 400 and writes nothing', async () => {
    const created = (await createSheet(modeller, 'Aquifer future')).body;
    const save = await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'From the future',
      document: aquiferDocument('Aquifer future'),
      digests: { run: 'c0ffee03' },
      engineVersion: ENGINE_VERSION + 1,
    });
    expect(save.status).toBe(400);
    expect(save.body.error.path).toEqual(['engineVersion']);
    expect((await modeller.agent.get(`/api/sheets/${created.id}`)).body.version).toBe(1);
  });
});

describe('final moments are saved with the digests', () => {
  const moments = { run: { paths: 200, final: { H: { mean: 2.97, variance: 0.078 } } } };

  it('returns them with the version, and a fork keeps them', async () => {
    const created = (await createSheet(modeller, 'Aquifer moments')).body;
    const save = await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Ran it',
      document: aquiferDocument('Aquifer moments'),
      digests: { run: 'c0ffee04' },
      moments,
      engineVersion: ENGINE_VERSION,
    });
    expect(save.status).toBe(201);
    const version = await modeller.agent.get(`/api/sheets/${created.id}/versions/2`);
    expect(version.body.moments).toEqual(moments);
    const fork = await modeller.agent.post(`/api/sheets/${created.id}/forks`).send({ version: 2 });
    expect(fork.status).toBe(201);
    const forked = await modeller.agent.get(`/api/sheets/${fork.body.id}/versions/1`);
    expect(forked.body.moments).toEqual(moments);
  });

  it('refuses moments of a simulation that has no digest with 400 and writes nothing', async () => {
    const created = (await createSheet(modeller, 'Aquifer stray moments')).body;
    const save = await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Stray',
      document: aquiferDocument('Aquifer stray moments'),
      moments,
    });
    expect(save.status).toBe(400);
    expect(save.body.error.path).toEqual(['moments', 'run']);
    expect((await modeller.agent.get(`/api/sheets/${created.id}`)).body.version).toBe(1);
  });
});

describe('a results summary is saved with a version', () => {
  /** A real summary of the aquifer sheet's run, as the page sends it. */
  async function aquiferResults(title: string) {
    const doc = parseSheetDocument(aquiferDocument(title));
    if (!doc.success) throw new Error('the aquifer document does not parse');
    const run = await runSheet(doc.data, { executor: inProcessExecutor() });
    const fingerprints = sheetFingerprints(doc.data, sheetCellDependencies(doc.data));
    return summariseResults(doc.data, (id) => run.outputs.get(id), fingerprints);
  }

  it('returns it with the version and the sheet, and a fork keeps it', async () => {
    const created = (await createSheet(modeller, 'Aquifer results')).body;
    const results = await aquiferResults('Aquifer results');
    const save = await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Ran it',
      document: aquiferDocument('Aquifer results'),
      results,
    });
    expect(save.status).toBe(201);
    expect((await modeller.agent.get(`/api/sheets/${created.id}/versions/2`)).body.results).toEqual(results);
    expect((await modeller.agent.get(`/api/sheets/${created.id}`)).body.results).toEqual(results);
    expect((await modeller.agent.get(`/api/sheets/${created.id}/versions/1`)).body.results).toBeNull();
    const fork = await modeller.agent.post(`/api/sheets/${created.id}/forks`).send({ version: 2 });
    expect((await modeller.agent.get(`/api/sheets/${fork.body.id}`)).body.results).toEqual(results);
  });

  it('refuses a summary of a cell the document does not have, with its path, and writes nothing', async () => {
    const created = (await createSheet(modeller, 'Aquifer stray results')).body;
    const { run, ...rest } = await aquiferResults('Aquifer stray results');
    const save = await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Stray',
      document: aquiferDocument('Aquifer stray results'),
      results: { ...rest, elsewhere: run },
    });
    expect(save.status).toBe(400);
    expect(save.body.error.path).toEqual(['results', 'elsewhere']);
    expect((await modeller.agent.get(`/api/sheets/${created.id}`)).body.version).toBe(1);
  });

  it('refuses a malformed summary with 400', async () => {
    const created = (await createSheet(modeller, 'Aquifer bad results')).body;
    const save = await modeller.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Bad',
      document: aquiferDocument('Aquifer bad results'),
      results: { run: { kind: 'simulation', savedTimes: 'soon' } },
    });
    expect(save.status).toBe(400);
    expect((await modeller.agent.get(`/api/sheets/${created.id}`)).body.version).toBe(1);
  });
});

describe('a new sheet made from another keeps its lineage', () => {
  it('stores the source sheet and version of "save mine as a new sheet"', async () => {
    const source = (await createSheet(modeller, 'Aquifer contested')).body;
    const copy = await createSheet(modeller, 'Aquifer contested (my copy)', {
      forkedFrom: { sheetId: source.id, version: 1 },
    });
    expect(copy.status).toBe(201);
    const sheet = await modeller.agent.get(`/api/sheets/${copy.body.id}`);
    expect(sheet.body).toMatchObject({ forkedFrom: source.id, forkedFromVersion: 1 });
    const listed = (await modeller.agent.get('/api/sheets')).body.sheets.find(
      (summary: { id: string }) => summary.id === copy.body.id,
    );
    expect(listed).toMatchObject({ forkedFrom: source.id, forkedFromVersion: 1 });
  });

  it('refuses a source the caller cannot read with 404 and creates nothing', async () => {
    const source = (await createSheet(modeller, 'Aquifer private')).body;
    const before = await sheetCount();
    const copy = await createSheet(stranger, 'Lifted', { forkedFrom: { sheetId: source.id, version: 1 } });
    expect(copy.status).toBe(404);
    expect(copy.body.error.code).toBe('sheets.not_found');
    expect(await sheetCount()).toBe(before);
  });

  it('refuses a source version that does not exist with 404 and creates nothing', async () => {
    const source = (await createSheet(modeller, 'Aquifer short history')).body;
    const before = await sheetCount();
    const copy = await createSheet(modeller, 'Too far', { forkedFrom: { sheetId: source.id, version: 9 } });
    expect(copy.status).toBe(404);
    expect(copy.body.error.code).toBe('sheets.version_not_found');
    expect(await sheetCount()).toBe(before);
  });
});
