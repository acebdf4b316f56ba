import { Router } from 'express';
import { z } from 'zod';
import { adminUpdateUserRequestSchema, adminUserListQuerySchema } from '@shared/api/admin';
import { requireSiteRole } from '../auth/session-middleware';
import { parseOr400 } from '../http/validate';
import { userNotFound } from './admin.errors';
import type { AdminUsecases } from './admin.usecases';

const userIdSchema = z.string().regex(/^[a-z0-9]{1,64}$/);

/** /api/admin/*: admins only (members get 403, anonymous callers 401). */
export function adminRoutes({ admin }: { admin: AdminUsecases }): Router {
  const router = Router();
  router.use(requireSiteRole('admin'));

  router.get('/users', async (req, res) => {
    const query = parseOr400(adminUserListQuerySchema, req.query);
    res.json(await admin.listUsers(query));
  });

  router.patch('/users/:id', async (req, res) => {
    const id = userIdSchema.safeParse(req.params.id);
    if (!id.success) throw userNotFound();
    const { role } = parseOr400(adminUpdateUserRequestSchema, req.body);
    res.json(await admin.setRole(id.data, role));
  });

  return router;
}
