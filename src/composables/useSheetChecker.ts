import { onScopeDispose, watch, type Ref } from 'vue';
import type { SheetDocument } from '@shared/sheet/document';

/** Runs the sheet checker a moment after the person stops typing, not on every keystroke. */
export function useSheetChecker(document: Ref<SheetDocument | null>, check: () => void, delayMs = 300): void {
  let timer: ReturnType<typeof setTimeout> | undefined;
  watch(document, () => {
    clearTimeout(timer);
    timer = setTimeout(check, delayMs);
  });
  onScopeDispose(() => clearTimeout(timer));
}
