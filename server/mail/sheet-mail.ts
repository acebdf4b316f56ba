import type { OutgoingMail } from './mailer';

/** Mail about sheets: a share notice, an invitation, new comments. Plain text, our own wording. */

const roleNote = {
  viewer: 'read it, run it in your browser and fork it',
  commenter: 'read it, run it, fork it and comment on its cells',
  editor: 'read, run, fork and comment on it, and save new versions',
} as const;

type GivenRole = keyof typeof roleNote;

export function shareNoticeMail(input: {
  to: string;
  name: string;
  sharedBy: string;
  sheetTitle: string;
  role: GivenRole;
  link: string;
}): OutgoingMail {
  return {
    to: input.to,
    subject: `${input.sharedBy} shared "${input.sheetTitle}" with you`,
    text: [
      `Hello ${input.name},`,
      '',
      `${input.sharedBy} made you ${input.role === 'editor' ? 'an' : 'a'} ${input.role} of the Meander sheet "${input.sheetTitle}".`,
      `You can ${roleNote[input.role]}:`,
      '',
      input.link,
    ].join('\n'),
  };
}

export function invitationMail(input: {
  to: string;
  invitedBy: string;
  sheetTitle: string;
  role: GivenRole;
  link: string;
  expiresAt: Date;
}): OutgoingMail {
  return {
    to: input.to,
    subject: `${input.invitedBy} invites you to the Meander sheet "${input.sheetTitle}"`,
    text: [
      'Hello,',
      '',
      `${input.invitedBy} invites you to work on the sheet "${input.sheetTitle}" in Meander as ${input.role === 'editor' ? 'an' : 'a'} ${input.role}:`,
      `you will be able to ${roleNote[input.role]}.`,
      '',
      'Open this link, then sign up (or sign in) with this e-mail address to accept:',
      '',
      input.link,
      '',
      `The link works once and until ${input.expiresAt.toISOString().slice(0, 10)}. If you do not know the sender, ignore this mail.`,
    ].join('\n'),
  };
}

export function commentMail(input: {
  to: string;
  name: string;
  author: string;
  sheetTitle: string;
  cellId: string;
  body: string;
  isReply: boolean;
  link: string;
}): OutgoingMail {
  const quoted = input.body
    .split('\n')
    .map((line) => `> ${line}`)
    .join('\n');
  return {
    to: input.to,
    subject: input.isReply
      ? `${input.author} replied on "${input.sheetTitle}"`
      : `${input.author} commented on "${input.sheetTitle}"`,
    text: [
      `Hello ${input.name},`,
      '',
      input.isReply
        ? `${input.author} replied in a thread you took part in, on cell ${input.cellId} of "${input.sheetTitle}":`
        : `${input.author} started a thread on cell ${input.cellId} of "${input.sheetTitle}":`,
      '',
      quoted,
      '',
      input.link,
    ].join('\n'),
  };
}
