import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as sheetsApi from '@/api/sheets';
import * as commentsApi from '@/api/comments';
import * as sharesApi from '@/api/shares';
import { useSheetEditorStore } from '@/stores/sheet-editor';
import { HEAD_POLL_MS } from '@/stores/sheet/head';
import type { SheetRole } from '@shared/api/rights';
import { buttonNamed, cardOf, click, mountSheet, pondSheet, settle, USER } from './harness';

vi.mock('@/api/sheets', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/sheets')>()),
  getSheet: vi.fn(),
  getVersion: vi.fn(),
  getHead: vi.fn(),
}));
vi.mock('@/api/comments', () => ({
  listComments: vi.fn(),
  createComment: vi.fn(),
  updateComment: vi.fn(),
  deleteComment: vi.fn(),
}));
vi.mock('@/api/shares', () => ({ listShares: vi.fn(), shareSheet: vi.fn() }));
vi.mock('@/workers/pool', () => ({ SimulationPool: class {} }));

const api = vi.mocked(sheetsApi);
const comments = vi.mocked(commentsApi);
const shares = vi.mocked(sharesApi);
let wrapper: VueWrapper | undefined;

function serve(role: SheetRole, version = 3): void {
  const document = pondSheet();
  api.getSheet.mockResolvedValue({
    id: 's1',
    title: document.title,
    owner: { id: 'u9', name: 'Lena Kowal' },
    role,
    forkSource: null,
    forkCount: 0,
    version,
    forkedFrom: null,
    forkedFromVersion: null,
    engineVersion: null,
    results: null,
    document,
    digests: {},
    createdAt: new Date('2026-11-01T08:00:00Z'),
    updatedAt: new Date('2026-11-02T08:00:00Z'),
  });
}

const comment = (id: string, body: string, author = { id: 'u9', name: 'Lena Kowal' }) => ({
  id,
  cellId: 'probe-bloom',
  version: 2,
  author,
  body,
  createdAt: new Date('2026-11-02T09:00:00Z'),
  editedAt: null,
});

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  comments.listComments.mockResolvedValue([]);
  api.getHead.mockResolvedValue(null);
});
afterEach(() => {
  wrapper?.unmount();
  wrapper = undefined;
  vi.useRealTimers();
  document.body.innerHTML = '';
});

describe('what a role may do on the sheet page', () => {
  it('shows a commenter read-only cells, Run all, and no Save version or Share', async () => {
    serve('commenter');
    ({ wrapper } = await mountSheet());
    expect(buttonNamed('Run all')).toBeTruthy();
    expect(() => buttonNamed('Save version')).toThrow();
    expect(() => buttonNamed('Share')).toThrow();
    expect(() => buttonNamed('Delete probe cell', cardOf('probe-bloom'))).toThrow();
    expect(document.body.textContent).toContain('commenter: you may read, run and comment');
  });
});

describe('comment threads beside a cell', () => {
  it('counts open threads on the card and opens them with the markdown rendered and the version they were written on', async () => {
    serve('commenter');
    comments.listComments.mockResolvedValue([
      {
        ...comment('c1', 'Is **50** the right bloom level?'),
        resolved: false,
        cellInCurrentVersion: true,
        replies: [],
      },
      { ...comment('c2', 'old remark'), resolved: true, cellInCurrentVersion: true, replies: [] },
    ]);
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Comments on probe cell: 1 open'));
    const aside = document.querySelector('aside[aria-label^="Comments on probe cell"]')!;
    expect(aside.querySelector('.comment-body strong')?.textContent).toBe('50');
    expect(aside.textContent).toContain('on version 2');
    expect(aside.textContent).toContain('Resolved');
    // A commenter may not delete someone else's comment.
    expect(aside.querySelector('button[aria-label="Delete comment by Lena Kowal"]')).toBeNull();
  });

  it('lists threads whose cell is gone at the sheet level', async () => {
    serve('owner');
    comments.listComments.mockResolvedValue([
      {
        ...comment('c3', 'about a removed cell'),
        cellId: 'chart-gone',
        resolved: false,
        cellInCurrentVersion: false,
        replies: [],
      },
    ]);
    ({ wrapper } = await mountSheet());
    const panel = document.querySelector('section[aria-label="Comments on removed cells"]');
    expect(panel?.textContent).toContain('about a removed cell');
    expect(panel?.textContent).toContain('chart-gone');
  });

  it('sends a new comment on the version shown and reloads the threads', async () => {
    serve('commenter');
    comments.createComment.mockResolvedValue('c9');
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Comments on probe cell: 0 open'));
    const box = document.querySelector<HTMLTextAreaElement>('textarea[aria-label="New comment"]')!;
    box.value = 'Check the level against the survey.';
    box.dispatchEvent(new Event('input'));
    await settle();
    await click(buttonNamed('Comment'));
    expect(comments.createComment).toHaveBeenCalledWith('s1', {
      cellId: 'probe-bloom',
      version: 3,
      body: 'Check the level against the survey.',
    });
    expect(comments.listComments).toHaveBeenCalledTimes(2);
  });
});

describe('the sharing dialog', () => {
  it('lists people and invitations and invites by e-mail with the role chosen', async () => {
    serve('owner');
    shares.listShares.mockResolvedValue({
      people: [{ userId: USER.id, name: USER.name, email: USER.email, role: 'owner' }],
      invitations: [
        { email: 'ravi.osei@example.test', role: 'viewer', expiresAt: new Date('2026-12-01T00:00:00Z') },
      ],
    });
    shares.shareSheet.mockResolvedValue({
      kind: 'invited',
      invitation: {
        email: 'new.person@example.test',
        role: 'commenter',
        expiresAt: new Date('2026-12-09T00:00:00Z'),
      },
    });
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Share'));
    expect(document.querySelector('ul[aria-label="Pending invitations"]')?.textContent).toContain(
      'ravi.osei@example.test',
    );
    const email = document.querySelector<HTMLInputElement>('input[aria-label="E-mail address"]')!;
    email.value = 'New.Person@example.test';
    email.dispatchEvent(new Event('input'));
    await settle();
    await click(buttonNamed('Invite'));
    expect(shares.shareSheet).toHaveBeenCalledWith('s1', 'new.person@example.test', 'commenter');
    expect(document.body.textContent).toContain('Invited new.person@example.test by e-mail as commenter.');
  });
});

describe('someone saved while you edit', () => {
  it('polls the head every 20 s and says a newer version exists; stops when the page goes', async () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    serve('editor', 3);
    api.getHead.mockResolvedValue({
      head: { version: 4, title: 'Pond algae', updatedAt: new Date('2026-11-03T08:00:00Z') },
      etag: '"4-1"',
    });
    ({ wrapper } = await mountSheet());
    expect(document.body.textContent).not.toContain('Someone saved version 4');
    vi.advanceTimersByTime(HEAD_POLL_MS);
    await settle();
    expect(api.getHead).toHaveBeenCalledWith('s1', null);
    expect(document.body.textContent).toContain('Someone saved version 4');
    wrapper.unmount();
    wrapper = undefined;
    api.getHead.mockClear();
    vi.advanceTimersByTime(HEAD_POLL_MS * 3);
    expect(api.getHead).not.toHaveBeenCalled();
    expect(useSheetEditorStore().newerVersion?.version).toBe(4);
  });
});
