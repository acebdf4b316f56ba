import { ref } from 'vue';
import { defineStore } from 'pinia';

/**
 * Which cards show their editor; the others show their reading view. A page concern, not part of
 * the document: it is never saved, and a freshly opened sheet reads.
 */
export const useCellViewStore = defineStore('cell-view', () => {
  const editing = ref<ReadonlySet<string>>(new Set());

  function setEditing(cellId: string, open: boolean): void {
    if (editing.value.has(cellId) === open) return;
    const next = new Set(editing.value);
    if (open) next.add(cellId);
    else next.delete(cellId);
    editing.value = next;
  }

  function toggle(cellId: string): void {
    setEditing(cellId, !editing.value.has(cellId));
  }

  function reset(): void {
    editing.value = new Set();
  }

  return { editing, setEditing, toggle, reset };
});
