import { SHARE_ERROR_CODES } from '@shared/api/shares';
import { AppError } from '../http/app-error';

export const personNotFound = () =>
  new AppError(404, SHARE_ERROR_CODES.personNotFound, 'This person has no role on the sheet.');

export const invitationNotFound = () =>
  new AppError(404, SHARE_ERROR_CODES.invitationNotFound, 'There is no pending invitation for this address.');

export const badInvitation = () =>
  new AppError(
    404,
    SHARE_ERROR_CODES.badInvitation,
    'This invitation link is not valid: it was already used, withdrawn, or the sheet is gone.',
  );

export const expiredInvitation = () =>
  new AppError(
    410,
    SHARE_ERROR_CODES.badInvitation,
    'This invitation has expired (links last 7 days). Ask the owner of the sheet to invite you again.',
  );

export const wrongAccount = (invited: string) =>
  new AppError(
    403,
    SHARE_ERROR_CODES.wrongAccount,
    `This invitation was sent to ${invited}. Sign in with that address (or sign up with it) to accept it.`,
  );

export const cannotShareWithOwner = () =>
  new AppError(
    400,
    SHARE_ERROR_CODES.cannotShareWithOwner,
    'The owner already has every right on the sheet.',
    {
      path: ['email'],
    },
  );

export const transferNeedsEditor = () =>
  new AppError(
    400,
    SHARE_ERROR_CODES.transferNeedsEditor,
    'Ownership goes to an editor of the sheet: make them an editor first.',
    { path: ['userId'] },
  );
