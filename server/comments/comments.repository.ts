import { and, asc, eq, or } from 'drizzle-orm';
import type { DbExecutor } from '../db/client';
import { users } from '../users/users.table';
import { comments, type CommentRow } from './comments.table';

const commentColumns = {
  id: comments.id,
  sheetId: comments.sheetId,
  cellId: comments.cellId,
  versionNumber: comments.versionNumber,
  authorId: comments.authorId,
  authorName: users.name,
  parentId: comments.parentId,
  body: comments.body,
  resolved: comments.resolved,
  createdAt: comments.createdAt,
  editedAt: comments.editedAt,
};

/** Queries on comments; rules live in the usecases. */
export function createCommentsRepository({ db }: { db: DbExecutor }) {
  return {
    /** Every comment of a sheet, oldest first (threads and replies together). */
    async listForSheet(sheetId: string) {
      return db
        .select(commentColumns)
        .from(comments)
        .innerJoin(users, eq(users.id, comments.authorId))
        .where(eq(comments.sheetId, sheetId))
        .orderBy(asc(comments.createdAt), comments.id);
    },

    async findById(id: string) {
      const [row] = await db
        .select(commentColumns)
        .from(comments)
        .innerJoin(users, eq(users.id, comments.authorId))
        .where(eq(comments.id, id));
      return row ?? null;
    },

    async insert(comment: Omit<CommentRow, 'createdAt' | 'editedAt' | 'resolved'> & { createdAt: Date }) {
      await db.insert(comments).values(comment);
    },

    async updateBody(id: string, body: string, at: Date) {
      await db.update(comments).set({ body, editedAt: at }).where(eq(comments.id, id));
    },

    async setResolved(id: string, resolved: boolean) {
      await db.update(comments).set({ resolved }).where(eq(comments.id, id));
    },

    /** Deletes a comment; a thread's first comment takes its replies with it. */
    async delete(id: string) {
      await db.delete(comments).where(eq(comments.id, id));
    },

    /** Everyone who wrote in a thread (its first comment and its replies). */
    async threadAuthors(threadId: string) {
      return db
        .selectDistinct({ id: users.id, name: users.name, email: users.email })
        .from(comments)
        .innerJoin(users, eq(users.id, comments.authorId))
        .where(and(or(eq(comments.id, threadId), eq(comments.parentId, threadId))));
    },
  };
}

export type CommentsRepository = ReturnType<typeof createCommentsRepository>;
export type CommentRecord = NonNullable<Awaited<ReturnType<CommentsRepository['findById']>>>;
