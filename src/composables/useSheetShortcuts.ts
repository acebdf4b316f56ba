import { onScopeDispose } from 'vue';
import { shortcutOf } from '@/views/sheet/shortcuts';
import { cellIdOf, focusCell } from '@/views/sheet/cell-focus';

export interface SheetShortcutActions {
  /** Ids of the cells in order, as they are now. */
  cellIds(): string[];
  runCell(cellId: string): void;
  save(): void;
  stop(): void;
  help(): void;
  toggleEdit(cellId: string): void;
  outline(): void;
  /** False while a dialog is open or the page is read-only for that action. */
  enabled(): boolean;
}

/**
 * The page's keyboard shortcuts (listed in the help panel), on the window so they work wherever
 * focus is inside the sheet. The focused cell is the card holding document.activeElement.
 */
export function useSheetShortcuts(actions: SheetShortcutActions): void {
  const neighbour = (cellId: string | null, delta: number): string | undefined => {
    const ids = actions.cellIds();
    if (ids.length === 0) return undefined;
    if (cellId === null) return delta > 0 ? ids[0] : ids[ids.length - 1];
    const at = ids.indexOf(cellId);
    return ids[Math.max(0, Math.min(ids.length - 1, at + delta))];
  };

  const onKeydown = (event: KeyboardEvent): void => {
    const shortcut = shortcutOf(event);
    if (!shortcut || !actions.enabled()) return;
    const cellId = cellIdOf(event.target) ?? cellIdOf(document.activeElement);
    const pageWide = {
      save: actions.save,
      stop: actions.stop,
      help: actions.help,
      outline: actions.outline,
    } as const;
    if (shortcut === 'save' || shortcut === 'stop' || shortcut === 'help' || shortcut === 'outline') {
      event.preventDefault();
      pageWide[shortcut]();
      return;
    }
    if (shortcut === 'previous' || shortcut === 'next') {
      event.preventDefault();
      focusCell(neighbour(cellId, shortcut === 'next' ? 1 : -1));
      return;
    }
    if (!cellId) return;
    event.preventDefault();
    if (shortcut === 'edit') actions.toggleEdit(cellId);
    else actions.runCell(cellId);
  };

  window.addEventListener('keydown', onKeydown);
  onScopeDispose(() => window.removeEventListener('keydown', onKeydown));
}
