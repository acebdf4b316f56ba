/** The sheet page's keyboard shortcuts: the help panel lists exactly these. */
export interface ShortcutDoc {
  keys: string;
  action: string;
}

export const SHEET_SHORTCUTS: readonly ShortcutDoc[] = [
  { keys: 'Ctrl/⌘ + Enter', action: 'Run the focused cell (and what it needs)' },
  { keys: 'Shift + Enter', action: 'Run the focused cell and move to the next one' },
  { keys: 'Alt + ↑', action: 'Focus the previous cell' },
  { keys: 'Alt + ↓', action: 'Focus the next cell' },
  { keys: 'Ctrl/⌘ + S', action: 'Save a version' },
  { keys: 'Escape', action: 'Close a menu or dialog' },
];

export type SheetShortcut = 'run' | 'run-and-next' | 'previous' | 'next' | 'save';

/** Which shortcut a key press is, if any. Shift + Enter is left to multi-line text fields. */
export function shortcutOf(event: KeyboardEvent): SheetShortcut | null {
  const mod = event.ctrlKey || event.metaKey;
  if (event.key === 'Enter' && mod && !event.altKey) return 'run';
  if (event.key === 'Enter' && event.shiftKey && !mod && !event.altKey) {
    const target = event.target as HTMLElement | null;
    return target?.tagName === 'TEXTAREA' ? null : 'run-and-next';
  }
  if (event.altKey && !mod && event.key === 'ArrowUp') return 'previous';
  if (event.altKey && !mod && event.key === 'ArrowDown') return 'next';
  if (mod && !event.altKey && !event.shiftKey && event.key.toLowerCase() === 's') return 'save';
  return null;
}
