import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type MailFake, startMailFake } from '../../server/mail/mail-fake';
import { createMailer } from '../../server/mail/mailer';
import { decodeQuotedPrintable, parseMail } from '../../server/mail/parse-mail';

let fake: MailFake;
let mailer: ReturnType<typeof createMailer>;

beforeAll(async () => {
  fake = await startMailFake({ port: 0 });
  mailer = createMailer({
    host: '127.0.0.1',
    port: fake.port,
    from: 'Meander <no-reply@meander.example.test>',
  });
});
afterAll(async () => {
  mailer.close();
  await fake.stop();
});

describe('mail fake and mailer', () => {
  it('captures a mail sent over SMTP with recipient, subject and text intact', async () => {
    const longLine = `https://meander.example.test/reset-password?token=${'Ab9_-'.repeat(20)}`;
    const text = `Grüße aus dem Flussdelta — naïve café test.\n\n${longLine}\n\nLast line.`;
    await mailer.send({ to: 'Ruth.Achterberg@example.test', subject: 'Änderung: Deltapegel ≥ 2 m', text });
    const message = fake.messages().at(-1)!;
    expect(message.to).toEqual(['Ruth.Achterberg@example.test']);
    expect(message.from).toContain('no-reply@meander.example.test');
    expect(message.subject).toBe('Änderung: Deltapegel ≥ 2 m');
    expect(message.text).toBe(text);
    expect(Number.isNaN(Date.parse(message.receivedAt))).toBe(false);
  });

  it('keeps messages in arrival order', async () => {
    const before = fake.messages().length;
    await mailer.send({ to: 'first@example.test', subject: 'one', text: 'one' });
    await mailer.send({ to: 'second@example.test', subject: 'two', text: 'two' });
    expect(
      fake
        .messages()
        .slice(before)
        .map((message) => message.subject),
    ).toEqual(['one', 'two']);
  });
});

describe('parseMail', () => {
  it('decodes quoted-printable soft breaks and escapes (RFC 2045 §6.7)', () => {
    expect(decodeQuotedPrintable('caf=C3=A9 and a very long =\nline')).toBe('café and a very long line');
  });

  it('reads the text/plain part of a multipart message and folded headers', () => {
    const raw = [
      'From: a@example.test',
      'To: b@example.test,',
      ' c@example.test',
      'Subject: =?UTF-8?B?U2FsaW5pdMOk?=',
      'Content-Type: multipart/alternative; boundary="xyz"',
      '',
      '--xyz',
      'Content-Type: text/plain; charset=utf-8',
      'Content-Transfer-Encoding: base64',
      '',
      Buffer.from('plain body').toString('base64'),
      '--xyz',
      'Content-Type: text/html',
      '',
      '<p>html body</p>',
      '--xyz--',
      '',
    ].join('\r\n');
    expect(parseMail(raw)).toEqual({
      from: 'a@example.test',
      to: ['b@example.test', 'c@example.test'],
      subject: 'Salinitä',
      text: 'plain body',
    });
  });
});
