import { adminUserListSchema, type AdminUser as AdminUserWire } from '@shared/api/admin';
import type { SiteRole } from '@shared/api/auth';
import { request, toDate } from './http';
import { parseAnswer } from './parse';

/** Site administration: the user list with search and paging, and site roles. */

export type AdminUser = Omit<AdminUserWire, 'createdAt'> & { createdAt: Date };

export interface AdminUserPage {
  users: AdminUser[];
  total: number;
}

export interface AdminUserQuery {
  search?: string;
  /** 1-based. */
  page?: number;
  pageSize?: number;
}

export async function listUsers(query: AdminUserQuery = {}): Promise<AdminUserPage> {
  const raw = await request('/api/admin/users', {
    query: { search: query.search?.trim(), page: query.page, pageSize: query.pageSize },
  });
  const answer = parseAnswer(adminUserListSchema, raw, 'the user list');
  return {
    total: answer.total,
    users: answer.users.map((user) => ({ ...user, createdAt: toDate(user.createdAt) })),
  };
}

export async function setUserRole(userId: string, role: SiteRole): Promise<void> {
  await request(`/api/admin/users/${encodeURIComponent(userId)}`, { method: 'PATCH', body: { role } });
}
