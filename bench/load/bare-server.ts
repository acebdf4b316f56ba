import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { createLucia, SESSION_COOKIE_NAME } from '../../server/auth/lucia';
import type { Db } from '../../server/db/client';
import { createSheetsRepository } from '../../server/sheets/sheets.repository';

/**
 * The baseline: node:http with the same SQL the app runs for the two measured routes (the
 * session lookup through the same lucia adapter, then the same repository calls, the save in the
 * same transaction), and nothing else: no Express, no headers, validation, document checks or
 * request log. The app's time over this one is its own overhead.
 */
export async function startBareServer(db: Db): Promise<{ url: string; close(): Promise<void> }> {
  const lucia = createLucia({ db, secureCookies: false });
  const sheets = createSheetsRepository({ db });
  const sessionUser = async (cookie: string | undefined) => {
    const token = new RegExp(`${SESSION_COOKIE_NAME}=([^;]+)`).exec(cookie ?? '')?.[1];
    return token ? (await lucia.validateSession(token)).user : null;
  };

  const server: Server = createServer((req, res) => {
    const answer = (status: number, body: unknown) => {
      res.writeHead(status, { 'Content-Type': 'application/json' }).end(JSON.stringify(body));
    };
    const chunks: Buffer[] = [];
    req.on('data', (chunk: Buffer) => chunks.push(chunk));
    req.on('end', () => {
      void (async () => {
        const user = await sessionUser(req.headers.cookie);
        if (!user) return answer(401, {});
        const [, , , id, versions] = (req.url ?? '').split('/');
        if (req.method === 'GET' && id) {
          const sheet = await sheets.findForUser(id, user.id);
          const version = sheet && (await sheets.findVersion(sheet.id, sheet.currentVersion));
          return version ? answer(200, { ...sheet, document: version.document }) : answer(404, {});
        }
        if (req.method === 'POST' && id && versions === 'versions') {
          const input = JSON.parse(Buffer.concat(chunks).toString('utf8')) as {
            baseVersion: number;
            message: string;
            document: Record<string, unknown>;
          };
          const saved = await db.transaction(async (tx) => {
            const txSheets = createSheetsRepository({ db: tx });
            const sheet = await txSheets.findForUserForUpdate(id, user.id);
            if (!sheet || sheet.currentVersion !== input.baseVersion) return null;
            const number = sheet.currentVersion + 1;
            await txSheets.insertVersion({
              sheetId: sheet.id,
              number,
              document: input.document as never,
              authorId: user.id,
              message: input.message,
              parentNumber: input.baseVersion,
              digests: {},
              moments: {},
              engineVersion: null,
            });
            await txSheets.advance(sheet.id, { currentVersion: number, title: sheet.title, at: new Date() });
            return number;
          });
          return saved === null ? answer(409, {}) : answer(201, { number: saved });
        }
        return answer(404, {});
      })().catch((error: unknown) => answer(500, { error: String(error) }));
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
