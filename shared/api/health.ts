import { z } from 'zod';

/** GET /api/health. */
export const healthSchema = z.object({ ok: z.boolean(), db: z.enum(['up', 'down']) });
export type Health = z.infer<typeof healthSchema>;
