import { generateIdFromEntropySize } from 'lucia';
import type { SiteRole } from '@shared/api/auth';
import { createPasswordHasher } from './auth/passwords';
import type { Db } from './db/client';
import type { Mailer } from './mail/mailer';
import { seedDemoGroup } from './seed-group';
import { demoSheetDocuments, demoSheetFiles } from './seed-sheets';
import { createSheetFeatures } from './sheets/sheet-features';
import { createUsersRepository } from './users/users.repository';

export interface DemoAccount {
  email: string;
  name: string;
  password: string;
  role: SiteRole;
}

/**
 * Fixed demo credentials for a local site (also in the README). They are public, so a site
 * that faces the internet must change them or start from an empty database.
 */
export const DEMO_ACCOUNTS: readonly DemoAccount[] = [
  { email: 'admin@example.test', name: 'Site Admin', password: 'meander-admin-demo', role: 'admin' },
  {
    email: 'maren.lindqvist@example.test',
    name: 'Maren Lindqvist',
    password: 'meander-member-demo',
    role: 'member',
  },
  { email: 'tomas.abara@example.test', name: 'Tomás Abara', password: 'meander-member-demo', role: 'member' },
  {
    email: 'aino.kettunen@example.test',
    name: 'Aino Kettunen',
    password: 'meander-member-demo',
    role: 'member',
  },
];

export interface SeedResult {
  /** False when the database already had users: nothing was written. */
  seeded: boolean;
  accounts: readonly DemoAccount[];
  sheetCount: number;
}

export interface SeedOptions {
  /** Sends the demo's mail (the pending invitation, comment notices); without it none goes out. */
  mailer?: Mailer;
  /** Where links in that mail point. */
  appOrigin?: string;
}

const noMail: Mailer = { send: async () => undefined };

/**
 * Demo accounts and sheets on an empty site; a site that has any user is left alone. The demo
 * sheets go to the first two members in turn, so each has something to open; the first sheet is
 * the demo research group's shared sheet (seed-group.ts).
 */
export async function seedDemo(db: Db, options: SeedOptions = {}): Promise<SeedResult> {
  const users = createUsersRepository({ db });
  if ((await users.countAll()) > 0) return { seeded: false, accounts: DEMO_ACCOUNTS, sheetCount: 0 };

  const hasher = createPasswordHasher();
  const ids: string[] = [];
  for (const account of DEMO_ACCOUNTS) {
    const id = generateIdFromEntropySize(10);
    await users.insert({
      id,
      email: account.email,
      name: account.name,
      passwordHash: await hasher.hash(account.password),
      role: account.role,
    });
    ids.push(id);
  }

  const features = createSheetFeatures({
    db,
    mailer: options.mailer ?? noMail,
    report: (error) => process.stderr.write(`[meander] demo mail failed: ${String(error)}\n`),
  });
  const [, maren, tomas, aino] = ids.map((id, index) => ({ id, email: DEMO_ACCOUNTS[index]!.email }));
  const owners = [maren!, tomas!];
  const documents = demoSheetDocuments();
  const created: string[] = [];
  for (const [index, document] of documents.entries()) {
    const owner = owners[index % owners.length]!;
    created.push((await features.sheets.createSheet(owner, { title: document.title, document })).id);
  }
  await seedDemoGroup(
    features,
    { owner: maren!, editor: tomas!, commenter: aino! },
    created[0]!,
    options.appOrigin ?? 'http://127.0.0.1:3000',
  );
  // A sheet with observed data comes as a sheet file: its dataset is stored with it.
  for (const file of demoSheetFiles()) await features.sheetFiles.importFile(maren!, file);
  // The editor's fork is a sheet too.
  return {
    seeded: true,
    accounts: DEMO_ACCOUNTS,
    sheetCount: documents.length + demoSheetFiles().length + 1,
  };
}
