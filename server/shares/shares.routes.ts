import { Router } from 'express';
import { z } from 'zod';
import {
  changeShareRequestSchema,
  shareEmailSchema,
  shareRequestSchema,
  transferOwnershipRequestSchema,
} from '@shared/api/shares';
import { currentUser, requireSignedIn } from '../auth/session-middleware';
import { parseOr400 } from '../http/validate';
import { requestOrigin } from '../sheets/request-origin';
import { parseSheetId } from '../sheets/sheets.routes';
import { badInvitation, invitationNotFound, personNotFound } from './shares.errors';
import type { SharesUsecases } from './shares.usecases';

const userIdSchema = z.string().regex(/^[a-z0-9]{1,64}$/);
const tokenSchema = z.string().regex(/^[A-Za-z0-9_-]{20,100}$/);

function parseUserId(value: unknown): string {
  const parsed = userIdSchema.safeParse(value);
  if (!parsed.success) throw personNotFound();
  return parsed.data;
}

function parseToken(value: unknown): string {
  const parsed = tokenSchema.safeParse(value);
  if (!parsed.success) throw badInvitation();
  return parsed.data;
}

/** /api/sheets/:id/shares, /invitations/:email and /owner (mounted beside the sheet routes). */
export function sheetSharesRoutes({
  shares,
  appOrigin,
}: {
  shares: SharesUsecases;
  appOrigin?: string;
}): Router {
  const router = Router();
  router.use(requireSignedIn());

  router.get('/:id/shares', async (req, res) => {
    res.json(await shares.listShares(currentUser(res), parseSheetId(req.params.id)));
  });

  router.post('/:id/shares', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const input = parseOr400(shareRequestSchema, req.body);
    res.status(201).json(await shares.share(currentUser(res), id, input, requestOrigin(req, appOrigin)));
  });

  router.patch('/:id/shares/:userId', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const userId = parseUserId(req.params.userId);
    const input = parseOr400(changeShareRequestSchema, req.body);
    res.json(await shares.changeRole(currentUser(res), id, userId, input));
  });

  router.delete('/:id/shares/:userId', async (req, res) => {
    const id = parseSheetId(req.params.id);
    await shares.revoke(currentUser(res), id, parseUserId(req.params.userId));
    res.status(204).end();
  });

  router.delete('/:id/invitations/:email', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const email = shareEmailSchema.safeParse(req.params.email);
    if (!email.success) throw invitationNotFound();
    await shares.cancelInvitation(currentUser(res), id, email.data);
    res.status(204).end();
  });

  router.post('/:id/owner', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const { userId } = parseOr400(transferOwnershipRequestSchema, req.body);
    res.json(await shares.transferOwnership(currentUser(res), id, userId));
  });

  return router;
}

/** /api/invitations/:token: a preview for anyone holding the link; accepting needs a session. */
export function invitationsRoutes({ shares }: { shares: SharesUsecases }): Router {
  const router = Router();

  router.get('/:token', async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await shares.previewInvitation(parseToken(req.params.token)));
  });

  router.post('/:token/accept', requireSignedIn(), async (req, res) => {
    const token = parseToken(req.params.token);
    res.json(await shares.acceptInvitation(currentUser(res), token));
  });

  return router;
}
