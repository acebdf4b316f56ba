import nodemailer from 'nodemailer';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
}

/** SMTP through nodemailer. The local fake speaks plain SMTP, so no STARTTLS is attempted. */
export function createMailer({
  host,
  port,
  from,
}: {
  host: string;
  port: number;
  from: string;
}): Mailer & { close(): void } {
  const transport = nodemailer.createTransport({ host, port, secure: false, ignoreTLS: true });
  return {
    async send(mail) {
      await transport.sendMail({ from, to: mail.to, subject: mail.subject, text: mail.text });
    },
    close: () => transport.close(),
  };
}
