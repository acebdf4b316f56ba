import { defineComponent, h, nextTick, type Component } from 'vue';
import { RouterView, createMemoryHistory, createRouter, type Router } from 'vue-router';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import type { SheetDocument } from '@shared/sheet/document';
import type { CellEditorMap } from '@/components/cells/editors';
import { cellEditorsKey, cellReadingsKey } from '@/components/cells/editors';
import { useSessionStore } from '@/stores/session';
import SheetView from '@/views/SheetView.vue';

/** Mounting the sheet page in jsdom with a memory router, a signed-in user and stub editors. */

export const USER = {
  id: 'u1',
  email: 'mira.okafor@example.test',
  name: 'Mira Okafor',
  role: 'member' as const,
};

/** A small invented sheet: algae in a pond, logistic growth with noise, one simulation and a probe. */
export function pondSheet(): SheetDocument {
  return {
    schemaVersion: 1,
    title: 'Pond algae',
    cells: [
      { id: 'note-intro', kind: 'note', text: '# Pond algae\nLogistic growth with weather noise.' },
      {
        id: 'params-main',
        kind: 'params',
        params: [
          { name: 'growth', value: 0.45, unit: '1/day' },
          { name: 'capacity', value: 60, unit: 'g/m2' },
        ],
      },
      {
        id: 'model-algae',
        kind: 'model',
        name: 'Algae',
        states: [
          {
            name: 'A',
            initial: '5',
            drift: 'growth * A * (1 - A / capacity)',
            diffusion: { weather: '0.12 * A' },
          },
        ],
        noises: [{ name: 'weather' }],
        calculus: 'ito',
      },
      {
        id: 'simulation-season',
        kind: 'simulation',
        model: 'model-algae',
        method: 'euler-maruyama',
        t0: 0,
        t1: 30,
        steps: 300,
        paths: 400,
        seed: 97,
        saveCount: 31,
        samplePaths: 5,
        boundaries: {},
        overrides: {},
      },
      {
        id: 'probe-bloom',
        kind: 'probe',
        simulation: 'simulation-season',
        quantity: 'exceedance',
        state: 'A',
        level: 50,
      },
    ],
  };
}

/** Stub editors: each shows its kind, so tests do not depend on the real editors or CodeMirror. */
export function stubEditors(): CellEditorMap {
  return stubViews('editor');
}

/** Stub reading views, likewise. */
export function stubReadings(): CellEditorMap {
  return stubViews('reading');
}

function stubViews(role: 'editor' | 'reading'): CellEditorMap {
  const stub = (kind: string): Component =>
    defineComponent({
      props: ['cell', 'document', 'issues', 'outputs', 'stale', 'readonly'],
      emits: ['update'],
      setup(props) {
        return () =>
          h(
            'div',
            { class: `stub-${role}`, 'data-kind': kind },
            `${kind} ${role} of ${(props.cell as { id: string }).id}`,
          );
      },
    });
  return {
    note: stub('note'),
    params: stub('params'),
    model: stub('model'),
    simulation: stub('simulation'),
    chart: stub('chart'),
    probe: stub('probe'),
    study: stub('study'),
    data: stub('data'),
    fit: stub('fit'),
    scenarios: stub('scenarios'),
    sweep: stub('sweep'),
  };
}

export interface MountedSheet {
  wrapper: VueWrapper;
  router: Router;
  pinia: Pinia;
}

export async function mountSheet(
  path = '/sheets/s1',
  editors: CellEditorMap = stubEditors(),
  readings: CellEditorMap = stubReadings(),
): Promise<MountedSheet> {
  const pinia = createPinia();
  setActivePinia(pinia);
  useSessionStore().me = USER;
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/sheets/:id', component: SheetView, props: true },
      { path: '/:rest(.*)*', component: { render: () => null } },
    ],
  });
  await router.push(path);
  await router.isReady();
  const wrapper = mount(defineComponent({ render: () => h(RouterView) }), {
    attachTo: document.body,
    global: {
      plugins: [pinia, router],
      provide: { [cellEditorsKey as symbol]: editors, [cellReadingsKey as symbol]: readings },
    },
  });
  await settle();
  return { wrapper, router, pinia };
}

/** Lets pending work finish: a run alone spans several tasks (see the store's run()). */
export async function settle(): Promise<void> {
  for (let i = 0; i < 6; i++) {
    await flushPromises();
    await new Promise((resolve) => setTimeout(resolve, 0));
    await nextTick();
  }
}

export function buttonNamed(name: string, root: ParentNode = document.body): HTMLButtonElement {
  const all = [...root.querySelectorAll<HTMLButtonElement>('button')];
  const found = all.find(
    (button) => (button.getAttribute('aria-label') ?? button.textContent?.trim()) === name,
  );
  if (!found) {
    const names = all.map((button) => button.getAttribute('aria-label') ?? button.textContent?.trim());
    throw new Error(`no button named "${name}"; buttons: ${names.join(' | ')}`);
  }
  return found;
}

export async function click(element: HTMLElement): Promise<void> {
  element.click();
  await settle();
}

/** Cell ids in the order the page shows them. */
export function shownCellIds(): string[] {
  return [...document.querySelectorAll<HTMLElement>('article[data-cell-id]')].map(
    (card) => card.dataset.cellId!,
  );
}

export function cardOf(cellId: string): HTMLElement {
  const card = document.querySelector<HTMLElement>(`article[data-cell-id="${cellId}"]`);
  if (!card) throw new Error(`no card for ${cellId}`);
  return card;
}
