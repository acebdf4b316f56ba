import { randomUUID } from 'node:crypto';
import { SMTPServer } from 'smtp-server';
import type { CapturedMail } from '@shared/api/mailbox';
import { parseMail } from './parse-mail';

export type { CapturedMail };

export interface MailFake {
  port: number;
  /** Newest last. */
  messages(): CapturedMail[];
  stop(): Promise<void>;
}

/** Reads captured mail; what the development mailbox route needs from the fake. */
export type MailboxReader = Pick<MailFake, 'messages'>;

const MAX_KEPT = 500;

/**
 * A local SMTP server on 127.0.0.1 that accepts everything and keeps it in memory, for
 * development and tests. Plain SMTP only: no TLS, no authentication.
 */
export async function startMailFake({ port }: { port: number }): Promise<MailFake> {
  const captured: CapturedMail[] = [];
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('error', callback);
      stream.on('end', () => {
        const parsed = parseMail(Buffer.concat(chunks).toString('utf8'));
        const envelopeTo = session.envelope.rcptTo.map((recipient) => recipient.address);
        const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
        captured.push({
          id: randomUUID(),
          from: parsed.from || envelopeFrom,
          to: envelopeTo.length > 0 ? envelopeTo : parsed.to,
          subject: parsed.subject,
          text: parsed.text,
          receivedAt: new Date().toISOString(),
        });
        if (captured.length > MAX_KEPT) captured.splice(0, captured.length - MAX_KEPT);
        callback();
      });
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  const address = server.server.address();
  const boundPort = address && typeof address === 'object' ? address.port : port;

  return {
    port: boundPort,
    messages: () => captured.slice(),
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
