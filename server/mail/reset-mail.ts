import type { OutgoingMail } from './mailer';

export function passwordResetMail({
  to,
  name,
  link,
}: {
  to: string;
  name: string;
  link: string;
}): OutgoingMail {
  return {
    to,
    subject: 'Choose a new Meander password',
    text: [
      `Hello ${name},`,
      '',
      'Someone (we hope you) asked to reset the password of the Meander account for this address.',
      'Open this link within one hour to choose a new password:',
      '',
      link,
      '',
      'The link works once. If you did not ask for it, ignore this mail: your password stays as it is.',
    ].join('\n'),
  };
}
