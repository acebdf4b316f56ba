import { defineAsyncComponent, type Component, type InjectionKey } from 'vue';
import type { CellKind } from '@shared/sheet/document';
import CellPlainView from './CellPlainView.vue';

/**
 * The editor component of each cell kind, beside the kind's shared module (shared/cells). Each
 * editor is its own chunk, loaded when a sheet first shows that kind; one that fails to load
 * falls back to a plain read-only view. The type asks for an editor for every kind.
 */
const loaders: Record<CellKind, () => Promise<Component>> = {
  note: () => import('./NoteCell.vue'),
  params: () => import('./ParamsCell.vue'),
  model: () => import('./ModelCell.vue'),
  simulation: () => import('./SimulationCell.vue'),
  chart: () => import('./ChartCell.vue'),
  probe: () => import('./ProbeCell.vue'),
  study: () => import('./StudyCell.vue'),
  data: () => import('./DataCell.vue'),
  fit: () => import('./FitCell.vue'),
  scenarios: () => import('./ScenariosCell.vue'),
  sweep: () => import('./SweepCell.vue'),
};

/**
 * The reading view of each kind, beside its editor: what the card shows until the person opens
 * the editor (equations, a parameter table, a summary line, results).
 */
const readingLoaders: Record<CellKind, () => Promise<Component>> = {
  note: () => import('./NoteReading.vue'),
  params: () => import('./ParamsReading.vue'),
  model: () => import('./ModelReading.vue'),
  simulation: () => import('./SimulationReading.vue'),
  chart: () => import('./ChartReading.vue'),
  probe: () => import('./ProbeReading.vue'),
  study: () => import('./StudyReading.vue'),
  data: () => import('./DataReading.vue'),
  fit: () => import('./FitReading.vue'),
  scenarios: () => import('./ScenariosReading.vue'),
  sweep: () => import('./SweepReading.vue'),
};

export type CellEditorMap = Partial<Record<CellKind, Component>>;

export const defaultCellEditors: Record<CellKind, Component> = Object.fromEntries(
  Object.entries(loaders).map(([kind, loader]) => [
    kind,
    defineAsyncComponent({ loader, errorComponent: CellPlainView }),
  ]),
) as Record<CellKind, Component>;

export const defaultCellReadings: Record<CellKind, Component> = Object.fromEntries(
  Object.entries(readingLoaders).map(([kind, loader]) => [
    kind,
    defineAsyncComponent({ loader, errorComponent: CellPlainView }),
  ]),
) as Record<CellKind, Component>;

/** Tests and stories provide their own map; the page uses the default one. */
export const cellEditorsKey: InjectionKey<CellEditorMap> = Symbol('cell editors');
export const cellReadingsKey: InjectionKey<CellEditorMap> = Symbol('cell readings');

/** Which kinds have an editor registered (for the registry's completeness test). */
export const editorKinds = (): CellKind[] => Object.keys(loaders) as CellKind[];
export const readingKinds = (): CellKind[] => Object.keys(readingLoaders) as CellKind[];

export { CellPlainView };
