import { Router } from 'express';
import {
  commentIdSchema,
  createCommentRequestSchema,
  updateCommentRequestSchema,
} from '@shared/api/comments';
import { currentUser, requireSignedIn } from '../auth/session-middleware';
import { parseOr400 } from '../http/validate';
import { requestOrigin } from '../sheets/request-origin';
import { parseSheetId } from '../sheets/sheets.routes';
import { commentNotFound } from './comments.errors';
import type { CommentsUsecases } from './comments.usecases';

function parseCommentId(value: unknown): string {
  const parsed = commentIdSchema.safeParse(value);
  if (!parsed.success) throw commentNotFound();
  return parsed.data;
}

/** /api/sheets/:id/comments (mounted beside the sheet routes). */
export function sheetCommentsRoutes({
  comments,
  appOrigin,
}: {
  comments: CommentsUsecases;
  appOrigin?: string;
}): Router {
  const router = Router();
  router.use(requireSignedIn());

  router.get('/:id/comments', async (req, res) => {
    res.json(await comments.listComments(currentUser(res), parseSheetId(req.params.id)));
  });

  router.post('/:id/comments', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const input = parseOr400(createCommentRequestSchema, req.body);
    res
      .status(201)
      .json(await comments.createComment(currentUser(res), id, input, requestOrigin(req, appOrigin)));
  });

  return router;
}

/** /api/comments/:id: edit, resolve or reopen, delete. */
export function commentsRoutes({ comments }: { comments: CommentsUsecases }): Router {
  const router = Router();
  router.use(requireSignedIn());

  router.patch('/:id', async (req, res) => {
    const id = parseCommentId(req.params.id);
    const input = parseOr400(updateCommentRequestSchema, req.body);
    res.json(await comments.updateComment(currentUser(res), id, input));
  });

  router.delete('/:id', async (req, res) => {
    await comments.deleteComment(currentUser(res), parseCommentId(req.params.id));
    res.status(204).end();
  });

  return router;
}
