import { and, count, desc, eq, ilike, or, sql } from 'drizzle-orm';
import type { SiteRole } from '@shared/api/auth';
import type { DbExecutor } from '../db/client';
import { type NewUserRow, users } from './users.table';

/** Queries on users; rules live in the usecases. */
export function createUsersRepository({ db }: { db: DbExecutor }) {
  return {
    async findByEmail(email: string) {
      const [row] = await db
        .select()
        .from(users)
        .where(eq(sql`lower(${users.email})`, email.toLowerCase()));
      return row ?? null;
    },

    async findById(id: string) {
      const [row] = await db.select().from(users).where(eq(users.id, id));
      return row ?? null;
    },

    async insert(user: NewUserRow) {
      const [row] = await db
        .insert(users)
        .values({ ...user, email: user.email.toLowerCase() })
        .returning();
      return row!;
    },

    async updateName(id: string, name: string) {
      const [row] = await db.update(users).set({ name }).where(eq(users.id, id)).returning();
      return row ?? null;
    },

    async updatePasswordHash(id: string, passwordHash: string) {
      await db.update(users).set({ passwordHash }).where(eq(users.id, id));
    },

    async updateRole(id: string, role: SiteRole) {
      const [row] = await db.update(users).set({ role }).where(eq(users.id, id)).returning();
      return row ?? null;
    },

    async countAll() {
      const [row] = await db.select({ total: count() }).from(users);
      return row?.total ?? 0;
    },

    /** Locks every admin row until the transaction ends, so two demotions cannot both pass the check. */
    async lockAdmins() {
      return db.select({ id: users.id }).from(users).where(eq(users.role, 'admin')).for('update');
    },

    /** Newest first; `search` matches e-mail or name, case-insensitively. */
    async list({ search, limit, offset }: { search: string; limit: number; offset: number }) {
      const pattern = `%${search.replace(/[\\%_]/g, (character) => `\\${character}`)}%`;
      const where = search ? or(ilike(users.email, pattern), ilike(users.name, pattern)) : undefined;
      const [rows, [totalRow]] = await Promise.all([
        db
          .select({
            id: users.id,
            email: users.email,
            name: users.name,
            role: users.role,
            createdAt: users.createdAt,
          })
          .from(users)
          .where(where)
          .orderBy(desc(users.createdAt), users.id)
          .limit(limit)
          .offset(offset),
        db.select({ total: count() }).from(users).where(and(where)),
      ]);
      return { rows, total: totalRow?.total ?? 0 };
    },
  };
}

export type UsersRepository = ReturnType<typeof createUsersRepository>;
