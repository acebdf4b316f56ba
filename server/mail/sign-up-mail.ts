import type { OutgoingMail } from './mailer';

export function confirmSignUpMail({
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
    subject: 'Confirm your new Meander account',
    text: [
      `Hello ${name},`,
      '',
      'Someone (we hope you) asked to create a Meander account for this address.',
      'Open this link within one day to confirm it; you will be signed in:',
      '',
      link,
      '',
      'If you did not ask for it, ignore this mail: no account is created.',
    ].join('\n'),
  };
}

/** To the owner of an address someone tried to sign up with again: no link, nothing changes. */
export function alreadyRegisteredMail({
  to,
  name,
  origin,
}: {
  to: string;
  name: string;
  origin: string;
}): OutgoingMail {
  return {
    to,
    subject: 'Someone tried to sign up with your address',
    text: [
      `Hello ${name},`,
      '',
      'Someone (perhaps you) tried to create a Meander account for this address, which already has a Meander account.',
      'Nothing was changed. If it was you, sign in, or choose a new password from the sign-in page:',
      '',
      `${origin}/sign-in`,
      '',
      'If it was not you, you need not do anything.',
    ].join('\n'),
  };
}
