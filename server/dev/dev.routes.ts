import { Router } from 'express';
import type { Mailbox } from '@shared/api/mailbox';
import { currentUser, requireSignedIn } from '../auth/session-middleware';
import type { MailboxReader } from '../mail/mail-fake';

/**
 * /api/dev/*: development helpers; mounted only outside production with an in-process mail fake.
 * The mailbox holds live reset links, so it needs a session: the site admin sees every captured
 * mail, a member only the mail addressed to them.
 */
export function devRoutes({ mailbox }: { mailbox: MailboxReader }): Router {
  const router = Router();
  router.get('/mailbox', requireSignedIn(), (_req, res) => {
    const user = currentUser(res);
    const own = (to: string[]) => to.some((address) => address.toLowerCase() === user.email.toLowerCase());
    const visible = mailbox.messages().filter((message) => user.role === 'admin' || own(message.to));
    const body: Mailbox = { messages: visible.reverse() };
    res.json(body);
  });
  return router;
}
