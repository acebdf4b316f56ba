import { sql } from 'drizzle-orm';
import { Router } from 'express';
import type { Health } from '@shared/api/health';
import type { Db } from '../db/client';

export function healthRoutes({ db }: { db: Db }): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const up = await db.execute(sql`select 1`).then(
      () => true,
      () => false,
    );
    const body: Health = { ok: up, db: up ? 'up' : 'down' };
    res.status(up ? 200 : 503).json(body);
  });
  return router;
}
