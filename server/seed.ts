import { generateIdFromEntropySize } from 'lucia';
import type { SiteRole } from '@shared/api/auth';
import { createPasswordHasher } from './auth/passwords';
import type { Db } from './db/client';
import { demoSheetDocuments } from './seed-sheets';
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
];

export interface SeedResult {
  /** False when the database already had users: nothing was written. */
  seeded: boolean;
  accounts: readonly DemoAccount[];
  sheetCount: number;
}

/**
 * Demo accounts and sheets on an empty site; a site that has any user is left alone. The demo
 * sheets go to the members in turn, so each has something to open.
 */
export async function seedDemo(db: Db): Promise<SeedResult> {
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

  const { sheets } = createSheetFeatures({ db });
  const owners = ids.slice(1);
  const documents = demoSheetDocuments();
  for (const [index, document] of documents.entries()) {
    const ownerId = owners[index % owners.length]!;
    await sheets.createSheet({ id: ownerId }, { title: document.title, document });
  }
  return { seeded: true, accounts: DEMO_ACCOUNTS, sheetCount: documents.length };
}
