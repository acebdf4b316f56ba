import {
  commentListSchema,
  createdCommentSchema,
  type Comment as CommentWire,
  type CommentThread as CommentThreadWire,
  type CreateCommentRequest,
  type UpdateCommentRequest,
} from '@shared/api/comments';
import { request, toDate } from './http';
import { parseAnswer } from './parse';

/** Comment threads on a sheet's cells. Dates leave here as `Date`s. */

export type Comment = Omit<CommentWire, 'createdAt' | 'editedAt'> & {
  createdAt: Date;
  editedAt: Date | null;
};
export type CommentThread = Omit<CommentThreadWire, 'createdAt' | 'editedAt' | 'replies'> &
  Comment & { replies: Comment[] };

const comment = <T extends CommentWire>(raw: T) => ({
  ...raw,
  createdAt: toDate(raw.createdAt),
  editedAt: raw.editedAt === null ? null : toDate(raw.editedAt),
});

export async function listComments(sheetId: string): Promise<CommentThread[]> {
  const answer = parseAnswer(
    commentListSchema,
    await request(`/api/sheets/${encodeURIComponent(sheetId)}/comments`),
    'the comments',
  );
  return answer.threads.map((thread: CommentThreadWire) => ({
    ...comment(thread),
    replies: thread.replies.map(comment),
  }));
}

export async function createComment(sheetId: string, body: CreateCommentRequest): Promise<string> {
  const answer = parseAnswer(
    createdCommentSchema,
    await request(`/api/sheets/${encodeURIComponent(sheetId)}/comments`, { method: 'POST', body }),
    'the new comment',
  );
  return answer.id;
}

export async function updateComment(commentId: string, body: UpdateCommentRequest): Promise<void> {
  await request(`/api/comments/${encodeURIComponent(commentId)}`, { method: 'PATCH', body });
}

export async function deleteComment(commentId: string): Promise<void> {
  await request(`/api/comments/${encodeURIComponent(commentId)}`, { method: 'DELETE' });
}
