import type { SheetAction } from '@shared/api/rights';

/**
 * Every route about sheets and what it asks of the rights table (shared/api/rights.ts). The
 * access-control test walks the app and fails on a route missing here, then runs each route for
 * every role and checks the answer against the table.
 *
 * - an action: the route works on one sheet (or one comment of it) and needs that right;
 * - 'signedIn': any signed-in user (their own list, a new sheet, accepting an invitation);
 * - 'public': no session needed (the invitation preview; the token is the credential).
 */
export type RouteRule = SheetAction | readonly SheetAction[] | 'signedIn' | 'public';

export const SHEET_ROUTE_RIGHTS = {
  'GET /api/sheets': 'signedIn',
  'POST /api/sheets': 'signedIn',
  'GET /api/sheets/:id': 'read',
  'PATCH /api/sheets/:id': 'rename',
  'DELETE /api/sheets/:id': 'delete',
  'GET /api/sheets/:id/head': 'read',
  'GET /api/sheets/:id/versions': 'read',
  'POST /api/sheets/:id/versions': 'saveVersion',
  'GET /api/sheets/:id/versions/:number': 'read',
  'GET /api/sheets/:id/versions/:number/file': 'read',
  'POST /api/sheets/import': 'signedIn',
  'POST /api/sheets/:id/versions/:number/restore': 'restore',
  'GET /api/sheets/:id/forks': 'read',
  'POST /api/sheets/:id/forks': 'fork',
  'GET /api/sheets/:id/shares': 'read',
  'POST /api/sheets/:id/shares': 'share',
  'PATCH /api/sheets/:id/shares/:userId': 'share',
  'DELETE /api/sheets/:id/shares/:userId': 'share',
  'DELETE /api/sheets/:id/invitations/:email': 'share',
  'POST /api/sheets/:id/owner': 'transfer',
  'GET /api/sheets/:id/comments': 'read',
  'POST /api/sheets/:id/comments': 'comment',
  'POST /api/sheets/:id/datasets': 'uploadData',
  /** A new body needs editComment, a resolved flag resolveComment. */
  'PATCH /api/comments/:id': ['editComment', 'resolveComment'],
  'DELETE /api/comments/:id': 'deleteComment',
  'GET /api/invitations/:token': 'public',
  'POST /api/invitations/:token/accept': 'signedIn',
} as const satisfies Record<string, RouteRule>;

export type SheetRoute = keyof typeof SHEET_ROUTE_RIGHTS;
