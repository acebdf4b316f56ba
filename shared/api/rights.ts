/**
 * Who may do what on a sheet: the one rule, read by the server (every sheet route asks it) and by
 * the client (to hide what a role does not allow). Site roles (member, admin) play no part here:
 * a site admin without a role on a sheet is a stranger to it.
 */

/** The error code of a 403 on a sheet; the error also carries `role` and `action`. */
export const SHEET_FORBIDDEN = 'sheets.forbidden';

/** Roles on a sheet, weakest first. A sheet has exactly one owner. */
export const SHEET_ROLES = ['viewer', 'commenter', 'editor', 'owner'] as const;
export type SheetRole = (typeof SHEET_ROLES)[number];

/** The roles an owner can give (ownership moves only by transfer). */
export const SHARE_ROLES = ['viewer', 'commenter', 'editor'] as const;
export type ShareRole = (typeof SHARE_ROLES)[number];

interface SheetRight {
  /** Roles that may do it. */
  roles: readonly SheetRole[];
  /** Roles that may do it to a comment they wrote themselves. */
  authorRoles?: readonly SheetRole[];
  /** What it is, to finish "you may …" and "to …, one must be …". */
  what: string;
  /** What it is for a role that may do it only as the author. */
  authorWhat?: string;
}

const everyone = ['viewer', 'commenter', 'editor', 'owner'] as const;
const commenters = ['commenter', 'editor', 'owner'] as const;
const editors = ['editor', 'owner'] as const;
const owner = ['owner'] as const;

export const SHEET_RIGHTS = {
  read: { roles: everyone, what: 'read it' },
  run: { roles: everyone, what: 'run it in your browser' },
  fork: { roles: everyone, what: 'fork it' },
  comment: { roles: commenters, what: 'comment on its cells' },
  resolveComment: { roles: commenters, what: 'resolve and reopen comments' },
  editComment: { roles: [], authorRoles: commenters, what: 'edit comments you wrote' },
  deleteComment: {
    roles: owner,
    authorRoles: commenters,
    what: 'delete comments',
    authorWhat: 'delete comments you wrote',
  },
  saveVersion: { roles: editors, what: 'save versions' },
  uploadData: { roles: editors, what: 'upload observed data' },
  rename: { roles: editors, what: 'rename it' },
  restore: { roles: editors, what: 'restore an old version' },
  share: { roles: owner, what: 'share it and change roles' },
  delete: { roles: owner, what: 'delete it' },
  transfer: { roles: owner, what: 'transfer its ownership' },
} as const satisfies Record<string, SheetRight>;

export type SheetAction = keyof typeof SHEET_RIGHTS;
export const SHEET_ACTIONS = Object.keys(SHEET_RIGHTS) as SheetAction[];

/** Whether `role` may do `action`; `isAuthor` when the action is on a comment the caller wrote. */
export function mayDo(role: SheetRole | null, action: SheetAction, isAuthor = false): boolean {
  if (!role) return false;
  const right: SheetRight = SHEET_RIGHTS[action];
  return right.roles.includes(role) || (isAuthor && (right.authorRoles ?? []).includes(role));
}

const withArticle = (role: SheetRole) =>
  role === 'owner' ? 'the owner' : `${role === 'editor' ? 'an' : 'a'} ${role}`;

function list(items: readonly string[], conjunction: 'and' | 'or'): string {
  return items.length <= 1
    ? (items[0] ?? '')
    : `${items.slice(0, -1).join(', ')} ${conjunction} ${items.at(-1)}`;
}

/** Everything `role` may do, in the table's order. */
export function allowedActions(role: SheetRole): SheetAction[] {
  return SHEET_ACTIONS.filter((action) => {
    const right: SheetRight = SHEET_RIGHTS[action];
    return right.roles.includes(role) || (right.authorRoles ?? []).includes(role);
  });
}

/** The 403 message: what the caller's role allows, and who may do what they asked. */
export function refusalMessage(role: SheetRole, action: SheetAction): string {
  const allowed = allowedActions(role).map((candidate) => {
    const right: SheetRight = SHEET_RIGHTS[candidate];
    return right.roles.includes(role) ? right.what : (right.authorWhat ?? right.what);
  });
  const right: SheetRight = SHEET_RIGHTS[action];
  const who = [...right.roles.map(withArticle), ...(right.authorRoles ? ["the comment's author"] : [])];
  return (
    `You are ${withArticle(role)} on this sheet: you may ${list(allowed, 'and')}. ` +
    `To ${right.what}, one must be ${list(who, 'or')}.`
  );
}
