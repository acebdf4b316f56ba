import { z } from 'zod';
import { cellIdSchema } from '../sheet/document';
import { versionNumberSchema } from './sheets';

/** Payloads of /api/sheets/:id/comments and /api/comments/:id. Bodies are markdown source. */

export const commentBodySchema = z
  .string()
  .trim()
  .min(1, 'a comment needs some text')
  .max(10_000, 'a comment is at most 10,000 characters');

export const commentIdSchema = z.string().regex(/^[a-z0-9]{1,64}$/, 'not a comment id');

export const createCommentRequestSchema = z.object({
  cellId: cellIdSchema,
  /** The version the comment was written on. */
  version: versionNumberSchema,
  body: commentBodySchema,
  /** A reply names the first comment of its thread (replies have no replies). */
  parentId: commentIdSchema.optional(),
});
export type CreateCommentRequest = z.infer<typeof createCommentRequestSchema>;

export const updateCommentRequestSchema = z
  .object({ body: commentBodySchema.optional(), resolved: z.boolean().optional() })
  .refine((value) => value.body !== undefined || value.resolved !== undefined, {
    message: 'send a new body, resolved, or both',
  });
export type UpdateCommentRequest = z.infer<typeof updateCommentRequestSchema>;

export const commentSchema = z.object({
  id: z.string(),
  cellId: z.string(),
  version: z.number().int(),
  author: z.object({ id: z.string(), name: z.string() }),
  body: z.string(),
  createdAt: z.string(),
  editedAt: z.string().nullable(),
});
export type Comment = z.infer<typeof commentSchema>;

export const updatedCommentSchema = commentSchema.extend({ resolved: z.boolean() });
export type UpdatedComment = z.infer<typeof updatedCommentSchema>;

export const commentThreadSchema = commentSchema.extend({
  resolved: z.boolean(),
  /** False when the current version no longer has this cell: the thread stays readable. */
  cellInCurrentVersion: z.boolean(),
  replies: z.array(commentSchema),
});
export type CommentThread = z.infer<typeof commentThreadSchema>;

export const commentListSchema = z.object({ threads: z.array(commentThreadSchema) });
export type CommentList = z.infer<typeof commentListSchema>;

export const createdCommentSchema = z.object({ id: z.string() });
export type CreatedComment = z.infer<typeof createdCommentSchema>;

export const COMMENT_ERROR_CODES = {
  notFound: 'comments.not_found',
  unknownCell: 'comments.unknown_cell',
  badParent: 'comments.bad_parent',
  replyNotResolvable: 'comments.reply_not_resolvable',
} as const;
