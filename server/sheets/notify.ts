import type { Mailer, OutgoingMail } from '../mail/mailer';

/** Sends mail after the work that caused it has committed; a failure is reported, never thrown. */
export type Notify = (mails: readonly OutgoingMail[]) => void;

export function createNotify({
  mailer,
  report,
}: {
  mailer: Mailer;
  report: (error: unknown) => void;
}): Notify {
  return (mails) => {
    for (const mail of mails) mailer.send(mail).catch(report);
  };
}

/** Links in mail point at the client's pages. */
export const sheetLink = (origin: string, sheetId: string) =>
  new URL(`/sheets/${sheetId}`, origin).toString();
export const invitationLink = (origin: string, token: string) =>
  new URL(`/invitations/${token}`, origin).toString();
