import type { AdminUser, AdminUserList, AdminUserListQuery } from '@shared/api/admin';
import type { SiteRole } from '@shared/api/auth';
import type { Transact } from '../db/transact';
import type { UsersRepository } from '../users/users.repository';
import type { UserRow } from '../users/users.table';
import { lastAdmin, userNotFound } from './admin.errors';

function toAdminUser(row: Pick<UserRow, 'id' | 'email' | 'name' | 'role' | 'createdAt'>): AdminUser {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    createdAt: row.createdAt.toISOString(),
  };
}

/** Site administration. Callers are checked for the admin role by the routes. */
export interface AdminUsecaseDeps {
  users: UsersRepository;
  /** Runs work in a transaction with a users repository bound to it. */
  transact: Transact<UsersRepository>;
}

export function createAdminUsecases({ users, transact }: AdminUsecaseDeps) {
  return {
    async listUsers(query: AdminUserListQuery): Promise<AdminUserList> {
      const { rows, total } = await users.list({
        search: query.search,
        limit: query.pageSize,
        offset: (query.page - 1) * query.pageSize,
      });
      return { users: rows.map(toAdminUser), total };
    },

    /** The site always keeps at least one admin: the admin rows are locked while this checks. */
    async setRole(userId: string, role: SiteRole): Promise<AdminUser> {
      return transact(async (txUsers) => {
        const admins = await txUsers.lockAdmins();
        const target = await txUsers.findById(userId);
        if (!target) throw userNotFound();
        if (target.role === 'admin' && role !== 'admin' && admins.length <= 1) throw lastAdmin();
        const updated = await txUsers.updateRole(userId, role);
        return toAdminUser(updated!);
      });
    },
  };
}

export type AdminUsecases = ReturnType<typeof createAdminUsecases>;
