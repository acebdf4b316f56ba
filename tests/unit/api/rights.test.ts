import { describe, expect, it } from 'vitest';
import { allowedActions, mayDo, refusalMessage, SHEET_ROLES } from '@shared/api/rights';

describe('the rights table', () => {
  // The rule as the sharing issue states it: each role adds to the one below.
  it('lets a viewer read, run and fork; a commenter also comment; an editor also save, upload data, rename, restore', () => {
    expect(allowedActions('viewer')).toEqual(['read', 'run', 'fork']);
    expect(allowedActions('commenter')).toEqual([
      'read',
      'run',
      'fork',
      'comment',
      'resolveComment',
      'editComment',
      'deleteComment',
    ]);
    expect(allowedActions('editor')).toEqual([
      ...allowedActions('commenter'),
      'saveVersion',
      'uploadData',
      'rename',
      'restore',
    ]);
  });

  it('keeps sharing, deleting and transferring to the owner', () => {
    for (const action of ['share', 'delete', 'transfer'] as const) {
      expect(SHEET_ROLES.filter((role) => mayDo(role, action))).toEqual(['owner']);
    }
  });

  it('lets only the author edit a comment, and the author or the owner delete it', () => {
    expect(SHEET_ROLES.filter((role) => mayDo(role, 'editComment', false))).toEqual([]);
    expect(SHEET_ROLES.filter((role) => mayDo(role, 'editComment', true))).toEqual([
      'commenter',
      'editor',
      'owner',
    ]);
    expect(SHEET_ROLES.filter((role) => mayDo(role, 'deleteComment', false))).toEqual(['owner']);
    // A viewer cannot have written a comment that is still theirs to delete.
    expect(mayDo('viewer', 'deleteComment', true)).toBe(false);
  });

  it('gives no right to someone without a role', () => {
    expect(mayDo(null, 'read')).toBe(false);
  });

  it('names what the role allows and who may do the refused thing', () => {
    expect(refusalMessage('viewer', 'saveVersion')).toBe(
      'You are a viewer on this sheet: you may read it, run it in your browser and fork it. ' +
        'To save versions, one must be an editor or the owner.',
    );
    expect(refusalMessage('editor', 'transfer')).toMatch(
      /To transfer its ownership, one must be the owner\.$/,
    );
  });
});
