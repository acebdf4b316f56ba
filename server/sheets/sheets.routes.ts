import { Router } from 'express';
import { z } from 'zod';
import {
  createSheetRequestSchema,
  forkRequestSchema,
  renameSheetRequestSchema,
  saveVersionRequestSchema,
  sheetIdSchema,
} from '@shared/api/sheets';
import { currentUser, requireSignedIn } from '../auth/session-middleware';
import { parseOr400 } from '../http/validate';
import type { ForksUsecases } from './forks.usecases';
import { sheetNotFound, versionNotFound } from './sheets.errors';
import type { SheetsUsecases } from './sheets.usecases';

const versionNumberSchema = z.coerce.number().int().min(1).max(2_147_483_647);

/** A malformed id cannot name any sheet: 404, like a sheet that does not exist. */
export function parseSheetId(value: unknown): string {
  const parsed = sheetIdSchema.safeParse(value);
  if (!parsed.success) throw sheetNotFound();
  return parsed.data;
}

function parseVersionNumber(value: unknown): number {
  const parsed = versionNumberSchema.safeParse(value);
  if (!parsed.success) throw versionNotFound();
  return parsed.data;
}

/** /api/sheets/*: signed-in callers only; rights are checked in the usecases (see route-rights.ts). */
export function sheetsRoutes({ sheets, forks }: { sheets: SheetsUsecases; forks: ForksUsecases }): Router {
  const router = Router();
  router.use(requireSignedIn());

  router.post('/', async (req, res) => {
    const input = parseOr400(createSheetRequestSchema, req.body);
    res.status(201).json(await sheets.createSheet(currentUser(res), input));
  });

  router.get('/', async (_req, res) => {
    res.json(await sheets.listSheets(currentUser(res)));
  });

  router.get('/:id', async (req, res) => {
    res.json(await sheets.getSheet(currentUser(res), parseSheetId(req.params.id)));
  });

  /** Polled by an open page: 304 while nothing changed (If-None-Match), else the new head. */
  router.get('/:id/head', async (req, res) => {
    const head = await sheets.getHead(currentUser(res), parseSheetId(req.params.id));
    res.setHeader('Cache-Control', 'no-cache');
    res.setHeader('ETag', `"${head.version}-${Date.parse(head.updatedAt)}"`);
    res.json(head);
  });

  router.patch('/:id', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const { title } = parseOr400(renameSheetRequestSchema, req.body);
    res.json(await sheets.renameSheet(currentUser(res), id, title));
  });

  router.delete('/:id', async (req, res) => {
    await sheets.deleteSheet(currentUser(res), parseSheetId(req.params.id));
    res.status(204).end();
  });

  router.post('/:id/versions', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const input = parseOr400(saveVersionRequestSchema, req.body);
    res.status(201).json(await sheets.saveVersion(currentUser(res), id, input));
  });

  router.get('/:id/versions', async (req, res) => {
    res.json(await sheets.listVersions(currentUser(res), parseSheetId(req.params.id)));
  });

  router.get('/:id/versions/:number', async (req, res) => {
    const id = parseSheetId(req.params.id);
    res.json(await sheets.getVersion(currentUser(res), id, parseVersionNumber(req.params.number)));
  });

  router.post('/:id/versions/:number/restore', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const number = parseVersionNumber(req.params.number);
    res.status(201).json(await sheets.restoreVersion(currentUser(res), id, number));
  });

  router.get('/:id/forks', async (req, res) => {
    res.json(await forks.listForks(currentUser(res), parseSheetId(req.params.id)));
  });

  router.post('/:id/forks', async (req, res) => {
    const id = parseSheetId(req.params.id);
    const input = parseOr400(forkRequestSchema, req.body ?? {});
    res.status(201).json(await forks.forkSheet(currentUser(res), id, input));
  });

  return router;
}
