import { sql } from 'drizzle-orm';
import type { Response } from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mayDo, SHEET_ACTIONS, type SheetAction, type SheetRole } from '@shared/api/rights';
import { SHEET_ROUTE_RIGHTS, type SheetRoute } from '../../server/sheets/route-rights';
import { createTestContext, signUp, type SignedUpUser, type TestContext, uniqueEmail } from './helpers';

/**
 * The access-control matrix: every sheet, share, comment, fork and version route, for every kind
 * of caller, against the rights table. Expected answers come from shared/api/rights.ts and
 * server/sheets/route-rights.ts; a refused request must leave the database as it was.
 */

const PERSONAS = ['owner', 'editor', 'commenter', 'viewer', 'stranger', 'admin', 'anonymous'] as const;
type Persona = (typeof PERSONAS)[number];
const ROLE_OF: Partial<Record<Persona, SheetRole>> = {
  owner: 'owner',
  editor: 'editor',
  commenter: 'commenter',
  viewer: 'viewer',
};
/** The fixture's comment thread is the commenter's. */
const COMMENT_AUTHOR: Persona = 'commenter';

let context: TestContext;
const users = {} as Record<Exclude<Persona, 'anonymous'>, SignedUpUser>;
let anonymous: TestAgent;

beforeAll(async () => {
  context = await createTestContext();
  for (const persona of PERSONAS) {
    if (persona === 'anonymous') continue;
    users[persona] = await signUp(context, { name: `Matrix ${persona}` });
  }
  await context.database.db.execute(sql`update users set role = 'admin' where id = ${users.admin.id}`);
  anonymous = context.agent();
});
afterAll(async () => {
  await context.close();
});

const agentOf = (persona: Persona): TestAgent => (persona === 'anonymous' ? anonymous : users[persona].agent);

/** An invented sheet: a tidal creek's salinity relaxing to the sea's, with a chart. */
function creekDocument(title: string, sigma = 0.3) {
  return {
    schemaVersion: 1,
    title,
    cells: [
      { id: 'about', kind: 'note', text: 'Salinity in a tidal creek.' },
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'k', value: 0.9 },
          { name: 's', value: sigma },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'S', initial: '12', drift: 'k * (30 - S)', diffusion: { B: 's * S' } }],
        noises: [{ name: 'B' }],
      },
      { id: 'run', kind: 'simulation', model: 'm', t1: 5, steps: 50, paths: 100, seed: 5 },
      { id: 'fan', kind: 'chart', simulation: 'run', view: 'fan', state: 'S' },
    ],
  };
}

interface Fixture {
  sheetId: string;
  commentId: string;
  invitedEmail: string;
}

/** A sheet at version 2, shared with editor, commenter and viewer, one invitation, one thread. */
async function makeFixture(): Promise<Fixture> {
  const owner = users.owner.agent;
  const created = await owner.post('/api/sheets').send({ title: 'Creek', document: creekDocument('Creek') });
  const sheetId = created.body.id as string;
  await owner
    .post(`/api/sheets/${sheetId}/versions`)
    .send({ baseVersion: 1, message: 'noisier', document: creekDocument('Creek', 0.4) })
    .expect(201);
  for (const persona of ['editor', 'commenter', 'viewer'] as const) {
    await owner
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: users[persona].email, role: persona })
      .expect(201);
  }
  const invitedEmail = uniqueEmail('invitee');
  await owner.post(`/api/sheets/${sheetId}/shares`).send({ email: invitedEmail, role: 'viewer' }).expect(201);
  const comment = await users.commenter.agent
    .post(`/api/sheets/${sheetId}/comments`)
    .send({ cellId: 'fan', version: 2, body: 'Why does the fan narrow at the end?' })
    .expect(201);
  return { sheetId, commentId: comment.body.id as string, invitedEmail };
}

interface Call {
  /** Which right this request exercises (a route may have several, e.g. edit and resolve). */
  action?: SheetAction;
  /** The status of an allowed request. */
  success: number;
  send(agent: TestAgent, fixture: Fixture): Promise<Response>;
}

/** One or more requests per route; a route in SHEET_ROUTE_RIGHTS without an entry here fails. */
const CALLS: Partial<Record<SheetRoute, Call[]>> = {
  'GET /api/sheets': [{ success: 200, send: (agent) => agent.get('/api/sheets') }],
  'POST /api/sheets': [{ success: 201, send: (agent) => agent.post('/api/sheets').send({ title: 'Mine' }) }],
  'GET /api/sheets/:id': [{ success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}`) }],
  'PATCH /api/sheets/:id': [
    { success: 200, send: (agent, f) => agent.patch(`/api/sheets/${f.sheetId}`).send({ title: 'Renamed' }) },
  ],
  'DELETE /api/sheets/:id': [{ success: 204, send: (agent, f) => agent.delete(`/api/sheets/${f.sheetId}`) }],
  'GET /api/sheets/:id/head': [
    { success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}/head`) },
  ],
  'GET /api/sheets/:id/versions': [
    { success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}/versions`) },
  ],
  'POST /api/sheets/:id/versions': [
    {
      success: 201,
      send: (agent, f) =>
        agent
          .post(`/api/sheets/${f.sheetId}/versions`)
          .send({ baseVersion: 2, message: 'calmer', document: creekDocument('Creek', 0.2) }),
    },
  ],
  'GET /api/sheets/:id/versions/:number': [
    { success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}/versions/1`) },
  ],
  'GET /api/sheets/:id/versions/:number/file': [
    { success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}/versions/2/file`) },
  ],
  'POST /api/sheets/import': [
    {
      success: 201,
      send: (agent) =>
        agent.post('/api/sheets/import').attach(
          'file',
          Buffer.from(
            JSON.stringify({
              format: 'meander.sheet',
              formatVersion: 1,
              exportedAt: '2026-01-01T00:00:00.000Z',
              engineVersion: 1,
              document: creekDocument('Imported creek'),
            }),
          ),
          'creek.meander.json',
        ),
    },
  ],
  'POST /api/sheets/:id/versions/:number/restore': [
    { success: 201, send: (agent, f) => agent.post(`/api/sheets/${f.sheetId}/versions/1/restore`) },
  ],
  'GET /api/sheets/:id/forks': [
    { success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}/forks`) },
  ],
  'POST /api/sheets/:id/forks': [
    { success: 201, send: (agent, f) => agent.post(`/api/sheets/${f.sheetId}/forks`).send({}) },
  ],
  'GET /api/sheets/:id/shares': [
    { success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}/shares`) },
  ],
  'POST /api/sheets/:id/shares': [
    {
      success: 201,
      send: (agent, f) =>
        agent.post(`/api/sheets/${f.sheetId}/shares`).send({ email: users.stranger.email, role: 'viewer' }),
    },
  ],
  'PATCH /api/sheets/:id/shares/:userId': [
    {
      success: 200,
      send: (agent, f) =>
        agent.patch(`/api/sheets/${f.sheetId}/shares/${users.viewer.id}`).send({ role: 'commenter' }),
    },
  ],
  'DELETE /api/sheets/:id/shares/:userId': [
    { success: 204, send: (agent, f) => agent.delete(`/api/sheets/${f.sheetId}/shares/${users.viewer.id}`) },
  ],
  'DELETE /api/sheets/:id/invitations/:email': [
    {
      success: 204,
      send: (agent, f) =>
        agent.delete(`/api/sheets/${f.sheetId}/invitations/${encodeURIComponent(f.invitedEmail)}`),
    },
  ],
  'POST /api/sheets/:id/owner': [
    {
      success: 200,
      send: (agent, f) => agent.post(`/api/sheets/${f.sheetId}/owner`).send({ userId: users.editor.id }),
    },
  ],
  'GET /api/sheets/:id/comments': [
    { success: 200, send: (agent, f) => agent.get(`/api/sheets/${f.sheetId}/comments`) },
  ],
  'POST /api/sheets/:id/comments': [
    {
      success: 201,
      send: (agent, f) =>
        agent.post(`/api/sheets/${f.sheetId}/comments`).send({ cellId: 'run', version: 2, body: 'Seed?' }),
    },
  ],
  'POST /api/sheets/:id/datasets': [
    {
      success: 201,
      send: (agent, f) =>
        agent
          .post(`/api/sheets/${f.sheetId}/datasets`)
          .attach('file', Buffer.from('day,salinity\n0,12\n1,14.5\n'), 'creek.csv'),
    },
  ],
  'PATCH /api/comments/:id': [
    {
      action: 'editComment',
      success: 200,
      send: (agent, f) => agent.patch(`/api/comments/${f.commentId}`).send({ body: 'Why narrow, late on?' }),
    },
    {
      action: 'resolveComment',
      success: 200,
      send: (agent, f) => agent.patch(`/api/comments/${f.commentId}`).send({ resolved: true }),
    },
  ],
  'DELETE /api/comments/:id': [
    { success: 204, send: (agent, f) => agent.delete(`/api/comments/${f.commentId}`) },
  ],
  // The token routes answer for the token, not a role: a made-up token is refused for everyone.
  'GET /api/invitations/:token': [
    { success: 404, send: (agent) => agent.get(`/api/invitations/${'x'.repeat(43)}`) },
  ],
  'POST /api/invitations/:token/accept': [
    { success: 404, send: (agent) => agent.post(`/api/invitations/${'x'.repeat(43)}/accept`) },
  ],
};

/** What the rights table says this caller gets. */
function expectedStatus(route: SheetRoute, call: Call, persona: Persona): number {
  const rule = SHEET_ROUTE_RIGHTS[route];
  if (rule === 'public') return call.success;
  if (persona === 'anonymous') return 401;
  if (rule === 'signedIn') return call.success;
  const role = ROLE_OF[persona];
  if (!role) return 404;
  const action = call.action ?? (rule as SheetAction);
  return mayDo(role, action, persona === COMMENT_AUTHOR) ? call.success : 403;
}

/** Everything a sheet request could change, as text. */
async function databaseState(): Promise<string> {
  const tables = [
    'users',
    'sheets',
    'sheet_versions',
    'sheet_shares',
    'sheet_invitations',
    'comments',
    'datasets',
  ];
  const parts: string[] = [];
  for (const table of tables) {
    const result = await context.database.db.execute(
      sql.raw(`select coalesce(json_agg(t order by t::text), '[]')::text as rows from ${table} t`),
    );
    parts.push(`${table}: ${String(result.rows[0]?.rows)}`);
  }
  return parts.join('\n');
}

interface RouterLayer {
  route?: { path: string; methods: Record<string, boolean> };
  rawPath?: string;
  handle: { stack?: RouterLayer[] };
}

/** Every route the app answers, as "METHOD /path", read from Express's router. */
function appRoutes(stack: RouterLayer[], prefix = ''): string[] {
  const join = (path: string | undefined) => (path && path !== '/' ? `${prefix}${path}` : prefix);
  return stack.flatMap((layer) => {
    if (layer.route) {
      return Object.keys(layer.route.methods)
        .filter((method) => layer.route!.methods[method])
        .map((method) => `${method.toUpperCase()} ${join(layer.route!.path)}`);
    }
    return layer.handle.stack ? appRoutes(layer.handle.stack, join(layer.rawPath)) : [];
  });
}

describe('the route rules cover every route', () => {
  it('lists every sheet, share, comment and invitation route of the app in route-rights.ts', () => {
    const app = context.app as unknown as { router: { stack: RouterLayer[] } };
    const served = appRoutes(app.router.stack).filter((route) =>
      /^\w+ \/api\/(sheets|comments|invitations)(\/|$)/.test(route),
    );
    expect(served.sort()).toEqual(Object.keys(SHEET_ROUTE_RIGHTS).sort());
  });

  it('has a request for every rule and exercises every server-side right', () => {
    const routes = Object.keys(SHEET_ROUTE_RIGHTS) as SheetRoute[];
    expect(routes.filter((route) => !CALLS[route]?.length)).toEqual([]);
    const exercised = new Set(
      routes.flatMap((route) => (CALLS[route] ?? []).map((call) => call.action ?? SHEET_ROUTE_RIGHTS[route])),
    );
    // Running a sheet happens in the browser: no route to check.
    expect(SHEET_ACTIONS.filter((action) => action !== 'run' && !exercised.has(action))).toEqual([]);
  });
});

describe('the access-control matrix', () => {
  let shared: Fixture;
  beforeAll(async () => {
    shared = await makeFixture();
  });

  const cells = (Object.keys(SHEET_ROUTE_RIGHTS) as SheetRoute[]).flatMap((route) =>
    (CALLS[route] ?? []).flatMap((call) => PERSONAS.map((persona) => ({ route, call, persona }))),
  );

  it.each(
    cells.map((cell) => [
      `${cell.route}${cell.call.action ? ` (${cell.call.action})` : ''}`,
      cell.persona,
      cell,
    ]),
  )('%s as %s answers as the rights table says', async (_name, _persona, { route, call, persona }) => {
    const expected = expectedStatus(route, call, persona);
    const allowed = expected >= 200 && expected < 300;
    // Allowed requests may change things: each gets a sheet of its own. Refusals share one.
    const fixture = allowed ? await makeFixture() : shared;
    const before = allowed ? '' : await databaseState();
    const response = await call.send(agentOf(persona), fixture);
    expect(response.status, JSON.stringify(response.body)).toBe(expected);
    if (expected === 403) {
      expect(response.body.error).toMatchObject({ code: 'sheets.forbidden', role: ROLE_OF[persona] });
      expect(response.body.error.message).toMatch(/^You are (a|an|the) \w+ on this sheet: you may read it/);
    }
    if (!allowed) expect(await databaseState()).toBe(before);
  });

  it('never reported an unexpected error', () => {
    expect(context.reported).toEqual([]);
  });
});
