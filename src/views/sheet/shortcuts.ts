/**
 * The sheet page's keyboard map. Meander's own keys are one family: Alt + Shift + a letter (⌥
 * Option + Shift on a Mac), matched on the physical key (`event.code`), so they work in any
 * keyboard layout and inside text fields, where a Mac's Option would otherwise type a symbol.
 * The family stays clear of the browsers' keys (Alt + Shift + A, I, T; the menu bar's Alt + F,
 * E, V, S, B, T, H), of screen readers' (Insert or Caps Lock for NVDA, JAWS and Narrator,
 * Control + Option for VoiceOver) and of Enter, which belongs to the field being typed in.
 */
export type SheetShortcut = 'run' | 'stop' | 'edit' | 'previous' | 'next' | 'outline' | 'help' | 'save';

export interface KeymapEntry {
  shortcut: Exclude<SheetShortcut, 'save'>;
  /** The physical key, as `KeyboardEvent.code`. */
  code: string;
  /** How the help panel writes the keys. */
  keys: string;
  action: string;
  /** A key press that triggers it (for tests and the help). */
  press: KeyboardEventInit;
}

const altShift = (letter: string, shortcut: KeymapEntry['shortcut'], action: string): KeymapEntry => ({
  shortcut,
  code: `Key${letter}`,
  keys: `Alt + Shift + ${letter}`,
  action,
  press: { key: letter, code: `Key${letter}`, altKey: true, shiftKey: true },
});

export const SHEET_KEYMAP: readonly KeymapEntry[] = [
  altShift('R', 'run', 'Run the cell with focus (and the cells it needs)'),
  altShift('X', 'stop', 'Stop the run going on'),
  altShift('O', 'edit', 'Open or close the editor of the cell with focus'),
  altShift('N', 'next', 'Go to the next cell'),
  altShift('P', 'previous', 'Go to the previous cell'),
  altShift('L', 'outline', 'Go to the outline of the sheet (wide windows)'),
  altShift('K', 'help', 'Show these keys'),
];

/** The help panel lists exactly these. */
export interface ShortcutDoc {
  keys: string;
  action: string;
}

export const SHEET_SHORTCUTS: readonly ShortcutDoc[] = [
  ...SHEET_KEYMAP.map(({ keys, action }) => ({ keys, action })),
  { keys: 'Ctrl/⌘ + S', action: 'Save a version' },
  { keys: 'Tab, Shift + Tab', action: 'Move through the buttons and fields of the page' },
  { keys: 'Escape', action: 'Close a menu or dialog' },
];

const BY_CODE = new Map(SHEET_KEYMAP.map((entry) => [entry.code, entry.shortcut]));

/** Which shortcut a key press is, if any. */
export function shortcutOf(event: KeyboardEvent): SheetShortcut | null {
  const mod = event.ctrlKey || event.metaKey;
  if (event.altKey && event.shiftKey && !mod) return BY_CODE.get(event.code) ?? null;
  if (mod && !event.altKey && !event.shiftKey && event.key.toLowerCase() === 's') return 'save';
  return null;
}
