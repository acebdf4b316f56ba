import { COMMENT_ERROR_CODES } from '@shared/api/comments';
import { AppError } from '../http/app-error';

/** Also what a comment on a sheet the caller cannot see answers. */
export const commentNotFound = () =>
  new AppError(
    404,
    COMMENT_ERROR_CODES.notFound,
    'There is no such comment, or its sheet is not shared with you.',
  );

export const unknownCell = (cellId: string, version: number) =>
  new AppError(400, COMMENT_ERROR_CODES.unknownCell, `Version ${version} has no cell "${cellId}".`, {
    path: ['cellId'],
  });

export const badParent = (reason: string) =>
  new AppError(400, COMMENT_ERROR_CODES.badParent, reason, { path: ['parentId'] });

export const replyNotResolvable = () =>
  new AppError(
    400,
    COMMENT_ERROR_CODES.replyNotResolvable,
    'Resolve or reopen the thread through its first comment, not a reply.',
    { path: ['resolved'] },
  );
