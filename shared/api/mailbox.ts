import { z } from 'zod';

/** GET /api/dev/mailbox (development only): the mails the local fake SMTP server captured. */
export const capturedMailSchema = z.object({
  id: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  /** ISO 8601. */
  receivedAt: z.string(),
});
export type CapturedMail = z.infer<typeof capturedMailSchema>;

export const mailboxSchema = z.object({ messages: z.array(capturedMailSchema) });
export type Mailbox = z.infer<typeof mailboxSchema>;
