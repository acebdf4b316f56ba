import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import { toRaw } from 'vue';
import { ENGINE_VERSION } from '@shared/engine/version';
import type { CellOutput } from '@shared/run/outputs';

/**
 * The browser's cache of the last results, in IndexedDB: a cell's output under the fingerprint of
 * its inputs and the engine version that computed it, so a reload (or another tab, or a fork with
 * the same cells) shows the numbers again as current when nothing they depend on changed. Only
 * whole, finished outputs are kept; the oldest entries go beyond MAX_ENTRIES.
 *
 * A cache that cannot open (a private window, storage turned off, a full disk) costs the reload
 * its numbers and nothing else: every call then resolves to "not cached".
 */

const DATABASE = 'meander-results';
const STORE = 'outputs';
/** Entries kept; the oldest are dropped first (common practice, no source). */
export const MAX_ENTRIES = 60;
/** Larger outputs (per-path values of very large runs) are not cached. */
export const MAX_ENTRY_BYTES = 96 * 1024 * 1024;

interface CachedOutput {
  key: string;
  savedAt: number;
  output: CellOutput;
}

interface ResultCacheSchema extends DBSchema {
  outputs: { key: string; value: CachedOutput; indexes: { savedAt: number } };
}

export interface ResultCache {
  get(fingerprint: string): Promise<CellOutput | undefined>;
  put(fingerprint: string, output: CellOutput): Promise<void>;
}

const keyOf = (fingerprint: string) => `engine-${ENGINE_VERSION}/${fingerprint}`;

/** Bytes held in typed arrays, which is where a large output's size is. */
export function outputBytes(value: unknown, seen = new Set<unknown>()): number {
  if (ArrayBuffer.isView(value)) return value.byteLength;
  if (value === null || typeof value !== 'object' || seen.has(value)) return 0;
  seen.add(value);
  let bytes = 0;
  for (const item of Object.values(value)) bytes += outputBytes(item, seen);
  return bytes;
}

/** Whether an output is worth keeping: finished, whole, and computed by this engine. */
function cacheable(output: CellOutput): boolean {
  if (output.kind === 'error') return false;
  if (output.kind === 'simulation')
    return !output.result.cancelled && output.engineVersion === ENGINE_VERSION;
  return true;
}

/** The cache in this browser's IndexedDB (opened on first use). */
export function createResultCache(): ResultCache {
  let opened: Promise<IDBPDatabase<ResultCacheSchema> | null> | null = null;
  const database = () => {
    opened ??=
      typeof indexedDB === 'undefined'
        ? Promise.resolve(null)
        : openDB<ResultCacheSchema>(DATABASE, 1, {
            upgrade(db) {
              db.createObjectStore(STORE, { keyPath: 'key' }).createIndex('savedAt', 'savedAt');
            },
          }).catch(() => null);
    return opened;
  };

  async function prune(db: IDBPDatabase<ResultCacheSchema>): Promise<void> {
    const count = await db.count(STORE);
    if (count <= MAX_ENTRIES) return;
    const tx = db.transaction(STORE, 'readwrite');
    let cursor = await tx.store.index('savedAt').openCursor();
    for (let extra = count - MAX_ENTRIES; cursor && extra > 0; extra--) {
      await cursor.delete();
      cursor = await cursor.continue();
    }
    await tx.done;
  }

  return {
    async get(fingerprint) {
      try {
        const db = await database();
        return (await db?.get(STORE, keyOf(fingerprint)))?.output;
      } catch {
        return undefined;
      }
    },
    async put(fingerprint, output) {
      const raw = toRaw(output);
      if (!cacheable(raw) || outputBytes(raw) > MAX_ENTRY_BYTES) return;
      try {
        const db = await database();
        if (!db) return;
        await db.put(STORE, { key: keyOf(fingerprint), savedAt: Date.now(), output: raw });
        await prune(db);
      } catch {
        // A full or closed store: the result stays on the page, only the reload loses it.
      }
    },
  };
}
