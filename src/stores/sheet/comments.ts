import { computed, ref } from 'vue';
import { mayDo } from '@shared/api/rights';
import * as commentsApi from '@/api/comments';
import type { Comment, CommentThread } from '@/api/comments';
import { errorMessage } from '@/api/http';
import type { SheetDocumentState } from './document';

/**
 * Comment threads on the sheet's cells: the threads by cell, the open count each card shows,
 * threads whose cell is gone (listed at the sheet level, never lost), and writing, replying,
 * resolving, editing and deleting. Every change reloads the threads from the server.
 */
export function useSheetComments(state: SheetDocumentState) {
  const threads = ref<CommentThread[]>([]);
  const commentsError = ref<string | null>(null);
  /** The cell whose threads are open beside it; null when none. */
  const openThreadsCellId = ref<string | null>(null);

  const threadsByCell = computed(() => {
    const byCell = new Map<string, CommentThread[]>();
    for (const thread of threads.value) {
      byCell.set(thread.cellId, [...(byCell.get(thread.cellId) ?? []), thread]);
    }
    return byCell;
  });
  const openCounts = computed(() => {
    const counts: Record<string, number> = {};
    for (const thread of threads.value) {
      if (!thread.resolved) counts[thread.cellId] = (counts[thread.cellId] ?? 0) + 1;
    }
    return counts;
  });
  /** Threads on cells the shown document does not have (deleted since, or not yet in an old version). */
  const orphanThreads = computed(() => {
    const ids = new Set(state.document.value?.cells.map((cell) => cell.id) ?? []);
    return threads.value.filter((thread) => !ids.has(thread.cellId));
  });

  const mayComment = computed(() => mayDo(state.role.value, 'comment'));
  const mayResolve = computed(() => mayDo(state.role.value, 'resolveComment'));
  const isMine = (comment: Comment) => comment.author.id === state.userId.value;
  const mayEdit = (comment: Comment) => mayDo(state.role.value, 'editComment', isMine(comment));
  const mayDelete = (comment: Comment) => mayDo(state.role.value, 'deleteComment', isMine(comment));

  async function loadComments(): Promise<void> {
    const id = state.sheetId.value;
    if (!id) return;
    try {
      threads.value = await commentsApi.listComments(id);
      commentsError.value = null;
    } catch (error) {
      commentsError.value = errorMessage(error);
    }
  }

  async function change(action: () => Promise<unknown>): Promise<boolean> {
    commentsError.value = null;
    try {
      await action();
      await loadComments();
      return true;
    } catch (error) {
      commentsError.value = errorMessage(error);
      return false;
    }
  }

  /** A new thread on a cell, written on the version shown; `parentId` makes it a reply. */
  const writeComment = (cellId: string, body: string, parentId?: string) =>
    change(() =>
      commentsApi.createComment(state.sheetId.value!, {
        cellId,
        version: state.version.value,
        body,
        ...(parentId ? { parentId } : {}),
      }),
    );
  const setResolved = (threadId: string, resolved: boolean) =>
    change(() => commentsApi.updateComment(threadId, { resolved }));
  const editComment = (commentId: string, body: string) =>
    change(() => commentsApi.updateComment(commentId, { body }));
  const deleteComment = (commentId: string) => change(() => commentsApi.deleteComment(commentId));

  function openThreads(cellId: string | null): void {
    openThreadsCellId.value = openThreadsCellId.value === cellId ? null : cellId;
  }

  function resetComments(): void {
    threads.value = [];
    commentsError.value = null;
    openThreadsCellId.value = null;
  }

  return {
    threads,
    commentsError,
    openThreadsCellId,
    threadsByCell,
    openCounts,
    orphanThreads,
    mayComment,
    mayResolve,
    mayEdit,
    mayDelete,
    loadComments,
    writeComment,
    setResolved,
    editComment,
    deleteComment,
    openThreads,
    resetComments,
  };
}
