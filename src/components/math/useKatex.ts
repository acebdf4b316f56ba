import { ref, shallowRef } from 'vue';
import type { KatexOptions } from 'katex';

type Katex = typeof import('katex').default;

/** KaTeX (about 270 kB with its stylesheet and fonts) is fetched once, when a sheet first shows math. */
let loading: Promise<Katex> | null = null;

function loadKatex(): Promise<Katex> {
  loading ??= Promise.all([import('katex'), import('katex/dist/katex.min.css')])
    .then(([module]) => module.default)
    .catch((error: unknown) => {
      loading = null; // a later formula may try again
      throw error;
    });
  return loading;
}

/**
 * Typesetting options: no command that reaches outside the formula (trust off: no \href, no
 * \includegraphics), no console warnings, and MathML beside the HTML for screen readers.
 */
export const KATEX_OPTIONS: KatexOptions = {
  throwOnError: false,
  trust: false,
  strict: 'ignore',
  output: 'htmlAndMathml',
  maxExpand: 100,
};

/** KaTeX for one formula: null until loaded; `error` says why it could not load. */
export function useKatex() {
  const katex = shallowRef<Katex | null>(null);
  const error = ref<string | null>(null);
  loadKatex().then(
    (module) => {
      katex.value = module;
    },
    (reason: unknown) => {
      error.value = `The formula could not be typeset (${reason instanceof Error ? reason.message : String(reason)}).`;
    },
  );
  return { katex, error };
}
