import { generateIdFromEntropySize } from 'lucia';
import type {
  Comment,
  CommentList,
  CommentThread,
  CreateCommentRequest,
  CreatedComment,
  UpdateCommentRequest,
  UpdatedComment,
} from '@shared/api/comments';
import { commentMail } from '../mail/sheet-mail';
import { type Notify, sheetLink } from '../sheets/notify';
import { requireRight, roleOn, type SheetActor } from '../sheets/sheet-rights';
import type { SheetRecord } from '../sheets/sheets.repository';
import { versionNotFound } from '../sheets/sheets.errors';
import type { SheetRepositories } from '../sheets/sheets.usecases';
import type { CommentRecord } from './comments.repository';
import { badParent, commentNotFound, replyNotResolvable, unknownCell } from './comments.errors';

function toComment(row: CommentRecord): Comment {
  return {
    id: row.id,
    cellId: row.cellId,
    version: row.versionNumber,
    author: { id: row.authorId, name: row.authorName },
    body: row.body,
    createdAt: row.createdAt.toISOString(),
    editedAt: row.editedAt?.toISOString() ?? null,
  };
}

function cellIdsOf(document: unknown): Set<string> {
  const cells = (document as { cells?: { id?: unknown }[] } | null)?.cells ?? [];
  return new Set(cells.map((cell) => cell.id).filter((id): id is string => typeof id === 'string'));
}

export interface CommentsUsecaseDeps {
  repositories: Pick<SheetRepositories, 'sheets' | 'comments' | 'shares' | 'users'>;
  notify: Notify;
  now?: () => Date;
}

/** Comments on cells: threads one reply deep, resolved and reopened, with mail to the people concerned. */
export function createCommentsUsecases({
  repositories,
  notify,
  now = () => new Date(),
}: CommentsUsecaseDeps) {
  const { sheets, comments, shares, users } = repositories;

  /** The comment and the caller's access to its sheet; a stranger learns nothing (404). */
  async function commentWithSheet(user: SheetActor, commentId: string) {
    const comment = await comments.findById(commentId);
    const sheet = comment ? await sheets.findForUser(comment.sheetId, user.id) : null;
    if (!comment || !sheet || !roleOn(sheet, user)) throw commentNotFound();
    return { comment, sheet };
  }

  /** A new thread: the owner and the editors. A reply: the thread's writers who can still read it. */
  async function recipients(sheet: SheetRecord, parentId: string | null | undefined) {
    if (!parentId) {
      const owner = await users.findById(sheet.ownerId);
      const editors = await shares.listUsersWithRoles(sheet.id, ['editor']);
      return [...(owner ? [owner] : []), ...editors];
    }
    const writers = await comments.threadAuthors(parentId);
    const stillOnSheet = await Promise.all(
      writers.map(async (writer) => {
        const access = await sheets.findForUser(sheet.id, writer.id);
        return access && roleOn(access, writer) ? writer : null;
      }),
    );
    return stillOnSheet.filter((writer) => writer !== null);
  }

  return {
    async listComments(user: SheetActor, sheetId: string): Promise<CommentList> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
      const current = await sheets.findVersion(sheet.id, sheet.currentVersion);
      const currentCells = cellIdsOf(current?.document);
      const rows = await comments.listForSheet(sheet.id);
      const threads = new Map<string, CommentThread>();
      for (const row of rows) {
        if (row.parentId) continue;
        threads.set(row.id, {
          ...toComment(row),
          resolved: row.resolved,
          cellInCurrentVersion: currentCells.has(row.cellId),
          replies: [],
        });
      }
      for (const row of rows) if (row.parentId) threads.get(row.parentId)?.replies.push(toComment(row));
      return { threads: [...threads.values()] };
    },

    async createComment(
      user: SheetActor,
      sheetId: string,
      input: CreateCommentRequest,
      origin: string,
    ): Promise<CreatedComment> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'comment');
      const version = await sheets.findVersion(sheet.id, input.version);
      if (!version) throw versionNotFound();
      if (!cellIdsOf(version.document).has(input.cellId)) throw unknownCell(input.cellId, input.version);
      if (input.parentId) {
        const parent = await comments.findById(input.parentId);
        if (!parent || parent.sheetId !== sheet.id) throw badParent('There is no such thread on this sheet.');
        if (parent.parentId)
          throw badParent('Reply to the first comment of the thread: replies have no replies.');
        if (parent.cellId !== input.cellId) throw badParent('A reply is on the same cell as its thread.');
      }
      const id = generateIdFromEntropySize(10);
      await comments.insert({
        id,
        sheetId: sheet.id,
        cellId: input.cellId,
        versionNumber: input.version,
        authorId: user.id,
        parentId: input.parentId ?? null,
        body: input.body,
        createdAt: now(),
      });
      const author = await users.findById(user.id);
      const people = (await recipients(sheet, input.parentId)).filter((person) => person.id !== user.id);
      notify(
        people.map((person) =>
          commentMail({
            to: person.email,
            name: person.name,
            author: author?.name ?? 'Someone',
            sheetTitle: sheet.title,
            cellId: input.cellId,
            body: input.body,
            isReply: Boolean(input.parentId),
            link: sheetLink(origin, sheet.id),
          }),
        ),
      );
      return { id };
    },

    /** The author edits the body; commenters and above resolve and reopen a thread. */
    async updateComment(
      user: SheetActor,
      commentId: string,
      input: UpdateCommentRequest,
    ): Promise<UpdatedComment> {
      const { comment, sheet } = await commentWithSheet(user, commentId);
      const isAuthor = comment.authorId === user.id;
      if (input.body !== undefined) requireRight(sheet, user, 'editComment', { isAuthor });
      if (input.resolved !== undefined) {
        requireRight(sheet, user, 'resolveComment', { isAuthor });
        if (comment.parentId) throw replyNotResolvable();
      }
      if (input.body !== undefined) await comments.updateBody(comment.id, input.body, now());
      if (input.resolved !== undefined) await comments.setResolved(comment.id, input.resolved);
      const updated = (await comments.findById(comment.id))!;
      return { ...toComment(updated), resolved: updated.resolved };
    },

    /** The author, or the owner; a thread's first comment takes its replies with it. */
    async deleteComment(user: SheetActor, commentId: string): Promise<void> {
      const { comment, sheet } = await commentWithSheet(user, commentId);
      requireRight(sheet, user, 'deleteComment', { isAuthor: comment.authorId === user.id });
      await comments.delete(comment.id);
    },
  };
}

export type CommentsUsecases = ReturnType<typeof createCommentsUsecases>;
