import { Router } from 'express';
import type { Mailbox } from '@shared/api/mailbox';
import type { MailboxReader } from '../mail/mail-fake';

/** /api/dev/*: development helpers; mounted only outside production with an in-process mail fake. */
export function devRoutes({ mailbox }: { mailbox: MailboxReader }): Router {
  const router = Router();
  router.get('/mailbox', (_req, res) => {
    const body: Mailbox = { messages: mailbox.messages().slice().reverse() };
    res.json(body);
  });
  return router;
}
