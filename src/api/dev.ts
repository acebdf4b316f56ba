import { mailboxSchema, type CapturedMail as CapturedMailWire } from '@shared/api/mailbox';
import { ApiError, request, toDate } from './http';
import { parseAnswer } from './parse';

/** Development helpers: the captured-mail mailbox. */

export type CapturedMail = Omit<CapturedMailWire, 'receivedAt'> & { receivedAt: Date };

/**
 * The mails the local fake SMTP server captured, newest first; `null` when the server has no
 * mailbox (production, or the mail fake is not running in-process: it answers 404).
 */
export async function listMailbox(): Promise<CapturedMail[] | null> {
  let raw: unknown;
  try {
    raw = await request('/api/dev/mailbox');
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) return null;
    throw error;
  }
  const answer = parseAnswer(mailboxSchema, raw, 'the mailbox');
  return answer.messages
    .map((mail) => ({ ...mail, receivedAt: toDate(mail.receivedAt) }))
    .sort((a, b) => b.receivedAt.getTime() - a.receivedAt.getTime());
}
