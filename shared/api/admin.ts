import { z } from 'zod';
import { siteRoleSchema } from './auth';

/** Payloads of /api/admin/*. */

export const adminUserListQuerySchema = z.object({
  search: z.string().trim().max(200).optional().default(''),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});
export type AdminUserListQuery = z.infer<typeof adminUserListQuerySchema>;

export const adminUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: siteRoleSchema,
  /** ISO 8601. */
  createdAt: z.string(),
});
export type AdminUser = z.infer<typeof adminUserSchema>;

export const adminUserListSchema = z.object({
  users: z.array(adminUserSchema),
  total: z.number().int(),
});
export type AdminUserList = z.infer<typeof adminUserListSchema>;

export const adminUpdateUserRequestSchema = z.object({ role: siteRoleSchema });
export type AdminUpdateUserRequest = z.infer<typeof adminUpdateUserRequestSchema>;
