/** Moving keyboard focus between cell cards (ids are restricted to letters, digits, "-" and "_"). */
export function cellElement(cellId: string): HTMLElement | null {
  return globalThis.document?.querySelector<HTMLElement>(`[data-cell-id="${cellId}"]`) ?? null;
}

export function focusCell(cellId: string | undefined | null): void {
  if (!cellId) return;
  const element = cellElement(cellId);
  element?.focus();
  element?.scrollIntoView?.({ block: 'nearest' });
}

/** The id of the cell card holding `target`, if any. */
export function cellIdOf(target: EventTarget | null): string | null {
  const element = target instanceof Element ? target.closest<HTMLElement>('[data-cell-id]') : null;
  return element?.dataset.cellId ?? null;
}
