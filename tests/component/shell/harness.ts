import { defineComponent, h } from 'vue';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { createMemoryHistory, RouterView, type Router } from 'vue-router';
import { NConfigProvider, NDialogProvider, NMessageProvider } from 'naive-ui';
import { createAppRouter } from '@/router';

/**
 * Mounts the real router (with its guards) inside naive-ui's providers, in memory, at `path`.
 * The api modules are mocked by each test file; the guard loads the session through them.
 */
export async function mountAt(path: string): Promise<{ wrapper: VueWrapper; router: Router; pinia: Pinia }> {
  const pinia = createPinia();
  setActivePinia(pinia);
  const router = createAppRouter(createMemoryHistory());
  const Root = defineComponent({
    setup: () => () =>
      h(NConfigProvider, null, () =>
        h(NMessageProvider, null, () => h(NDialogProvider, null, () => h(RouterView))),
      ),
  });
  const wrapper = mount(Root, { global: { plugins: [pinia, router] }, attachTo: document.body });
  await router.push(path);
  await router.isReady();
  await flushPromises();
  return { wrapper, router, pinia };
}

/** Types into a labelled input the way a person would: finds it by its visible label text. */
export async function fillByLabel(label: string, value: string): Promise<void> {
  const input = inputByLabel(label);
  input.value = value;
  input.dispatchEvent(new Event('input'));
  await flushPromises();
}

export function inputByLabel(label: string): HTMLInputElement {
  const labelElement = [...document.querySelectorAll('label')].find(
    (element) => element.textContent?.trim() === label,
  );
  if (!labelElement) throw new Error(`no label "${label}"`);
  const input = document.getElementById(labelElement.htmlFor);
  if (!(input instanceof HTMLInputElement)) throw new Error(`label "${label}" is not tied to an input`);
  return input;
}

export function buttonByText(text: string): HTMLButtonElement {
  const matches = [...document.querySelectorAll('button')].filter(
    (button) => button.textContent?.trim() === text,
  );
  if (matches.length === 0) throw new Error(`no button "${text}"`);
  return matches[matches.length - 1] as HTMLButtonElement;
}

export async function click(element: HTMLElement): Promise<void> {
  element.click();
  await flushPromises();
}
