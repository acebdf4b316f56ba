import { describe, expect, it } from 'vitest';
import { SHEET_KEYMAP, SHEET_SHORTCUTS, shortcutOf } from '@/views/sheet/shortcuts';

function key(init: KeyboardEventInit): KeyboardEvent {
  return new KeyboardEvent('keydown', { bubbles: true, cancelable: true, ...init });
}

/**
 * Key presses the sheet page must leave alone: the browsers' own (reload, history, toolbars, menu
 * bar access keys, opening a select), screen readers' (VoiceOver's Control+Option), and the
 * Enter-based run keys of other programs. From the browsers' and screen readers' published
 * shortcut lists, as remembered (from memory).
 */
const LEFT_ALONE: readonly [string, KeyboardEventInit][] = [
  ['Ctrl+Enter', { key: 'Enter', code: 'Enter', ctrlKey: true }],
  ['⌘+Enter', { key: 'Enter', code: 'Enter', metaKey: true }],
  ['Shift+Enter', { key: 'Enter', code: 'Enter', shiftKey: true }],
  ['Alt+Enter', { key: 'Enter', code: 'Enter', altKey: true }],
  ['Enter', { key: 'Enter', code: 'Enter' }],
  ['Alt+↓ (opens a select)', { key: 'ArrowDown', code: 'ArrowDown', altKey: true }],
  ['Alt+↑', { key: 'ArrowUp', code: 'ArrowUp', altKey: true }],
  ['Alt+← (back)', { key: 'ArrowLeft', code: 'ArrowLeft', altKey: true }],
  ['Ctrl+R (reload)', { key: 'r', code: 'KeyR', ctrlKey: true }],
  ['Ctrl+Shift+R (reload)', { key: 'R', code: 'KeyR', ctrlKey: true, shiftKey: true }],
  ['Alt+Shift+T (toolbar)', { key: 'T', code: 'KeyT', altKey: true, shiftKey: true }],
  ['Alt+Shift+I (feedback)', { key: 'I', code: 'KeyI', altKey: true, shiftKey: true }],
  ['Alt+Shift+A (dialogs)', { key: 'A', code: 'KeyA', altKey: true, shiftKey: true }],
  ['Ctrl+Option+R (VoiceOver)', { key: 'r', code: 'KeyR', ctrlKey: true, altKey: true }],
  ['Ctrl+Option+Shift+R', { key: 'R', code: 'KeyR', ctrlKey: true, altKey: true, shiftKey: true }],
  ...['F', 'E', 'V', 'S', 'B', 'T', 'H'].map((letter): [string, KeyboardEventInit] => [
    `Alt+${letter} (menu bar)`,
    { key: letter.toLowerCase(), code: `Key${letter}`, altKey: true },
  ]),
];

describe("Meander's keyboard map", () => {
  it.each(LEFT_ALONE)('leaves %s to the browser, the screen reader or the text field', (_name, init) => {
    expect(shortcutOf(key(init))).toBeNull();
  });

  it('never uses Enter, and no key is used twice', () => {
    const keys = SHEET_KEYMAP.map((entry) => entry.code);
    expect(new Set(keys).size).toBe(keys.length);
    expect(keys).not.toContain('Enter');
  });

  it('avoids the letters of the browsers menu bars even with Shift', () => {
    for (const entry of SHEET_KEYMAP)
      expect(['KeyF', 'KeyE', 'KeyV', 'KeyS', 'KeyB', 'KeyT', 'KeyH']).not.toContain(entry.code);
  });

  it('reads the physical key, so ⌥ Option characters on a Mac still match', () => {
    // Option+Shift+R on a Mac reports the character ‰, not R.
    expect(shortcutOf(key({ key: '‰', code: 'KeyR', altKey: true, shiftKey: true }))).toBe('run');
  });

  it('lists every action of the map in the help, each with its keys', () => {
    expect(SHEET_SHORTCUTS.map((s) => s.keys)).toEqual(
      expect.arrayContaining(SHEET_KEYMAP.map((entry) => entry.keys)),
    );
    for (const entry of SHEET_KEYMAP) expect(shortcutOf(key(entry.press))).toBe(entry.shortcut);
  });
});
