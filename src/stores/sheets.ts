import { importSheetFile } from '@/api/sheet-files';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import * as sheetsApi from '@/api/sheets';
import type { CreatedSheet, SheetSummary } from '@/api/sheets';
import { errorMessage } from '@/api/http';
import { useSessionStore } from './session';

/** The signed-in user's sheets and those shared with them: load, create, rename, delete. */
export const useSheetsStore = defineStore('sheets', () => {
  const items = ref<SheetSummary[]>([]);
  const loaded = ref(false);
  const loading = ref(false);
  const error = ref<string | null>(null);

  async function fetchAll(): Promise<void> {
    loading.value = true;
    try {
      items.value = await sheetsApi.listSheets();
      error.value = null;
      loaded.value = true;
    } catch (cause) {
      error.value = errorMessage(cause);
    } finally {
      loading.value = false;
    }
  }

  async function create(title: string): Promise<CreatedSheet> {
    const created = await sheetsApi.createSheet({ title: title.trim() });
    const now = new Date();
    const me = useSessionStore().me;
    items.value = [
      {
        id: created.id,
        title: created.title,
        role: 'owner',
        owner: { id: me?.id ?? '', name: me?.name ?? '' },
        version: created.version,
        forkedFrom: null,
        forkedFromVersion: null,
        createdAt: now,
        updatedAt: now,
      },
      ...items.value,
    ];
    return created;
  }

  async function rename(id: string, title: string): Promise<void> {
    const trimmed = title.trim();
    await sheetsApi.renameSheet(id, trimmed);
    items.value = items.value.map((sheet) =>
      sheet.id === id ? { ...sheet, title: trimmed, updatedAt: new Date() } : sheet,
    );
  }

  async function remove(id: string): Promise<void> {
    await sheetsApi.deleteSheet(id);
    items.value = items.value.filter((sheet) => sheet.id !== id);
  }

  function reset(): void {
    items.value = [];
    loaded.value = false;
    error.value = null;
  }

  /** A sheet file exported from Meander, as a new sheet of the caller's; the list is refetched. */
  async function importFile(file: File): Promise<CreatedSheet> {
    const created = await importSheetFile(file, file.name);
    await fetchAll();
    return created;
  }

  return { items, loaded, loading, error, fetchAll, create, importFile, rename, remove, reset };
});
