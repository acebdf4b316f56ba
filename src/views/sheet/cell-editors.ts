import { defineAsyncComponent, type Component, type InjectionKey } from 'vue';
import type { CellKind } from '@shared/sheet/document';
import CellPlainView from './CellPlainView.vue';

/**
 * The editor component of each cell kind, from src/components/cells/. Found with a glob, so a
 * kind whose editor is not written yet (or fails to load) falls back to a plain read-only view.
 * Each editor is its own chunk, loaded when a sheet first shows that kind.
 */
const EDITOR_FILES: Record<CellKind, string> = {
  note: 'NoteCell',
  params: 'ParamsCell',
  model: 'ModelCell',
  simulation: 'SimulationCell',
  chart: 'ChartCell',
  probe: 'ProbeCell',
  study: 'StudyCell',
};

const modules = import.meta.glob<{ default: Component }>('../../components/cells/*Cell.vue');

export type CellEditorMap = Partial<Record<CellKind, Component>>;

function buildEditorMap(): CellEditorMap {
  const map: CellEditorMap = {};
  for (const [kind, file] of Object.entries(EDITOR_FILES) as [CellKind, string][]) {
    const loader = modules[`../../components/cells/${file}.vue`];
    if (!loader) continue;
    map[kind] = defineAsyncComponent({ loader, errorComponent: CellPlainView });
  }
  return map;
}

export const defaultCellEditors: CellEditorMap = buildEditorMap();

/** Tests and stories provide their own map; the page uses the default one. */
export const cellEditorsKey: InjectionKey<CellEditorMap> = Symbol('cell editors');

export { CellPlainView };
