import { ref, watch, type Ref } from 'vue';

/**
 * Text a person typed that could not be stored in the cell yet (a bad name, "abc" for a number).
 * Kept outside the component, keyed by cell id and field, so a re-mounted editor (the page may
 * re-create cards when cells move) shows it again instead of losing it.
 */
const pendingText = new Map<string, { text: string; over: string }>();

export interface FieldDraft {
  /** What the input shows: the typed text, valid or not. */
  text: Ref<string>;
  /**
   * Record new typed text. `accepted` says whether it went into the cell (and then the value the
   * cell will carry, in its text form), so the echo coming back through props is not mistaken for
   * an outside change that should overwrite what is being typed ("1." must not become "1").
   */
  type(value: string, accepted: string | null): void;
}

/**
 * Local edit state for one field of a cell. It follows the prop only when the prop really changes
 * (someone else's edit, an undo, a reload), never when the cell is merely re-rendered.
 */
export function useFieldDraft(key: () => string, committed: () => string): FieldDraft {
  // Typed text is shown again only over the value it was typed over; if the cell has changed
  // since (an undo, someone else's save), the cell wins.
  const pending = pendingText.get(key());
  const text = ref(pending && pending.over === committed() ? pending.text : committed());
  let lastAccepted: string | null = null;

  watch(committed, (next) => {
    if (next === lastAccepted) return;
    text.value = next;
    pendingText.delete(key());
  });

  function type(value: string, accepted: string | null): void {
    text.value = value;
    if (accepted === null) {
      pendingText.set(key(), { text: value, over: committed() });
    } else {
      lastAccepted = accepted;
      pendingText.delete(key());
    }
  }

  return { text, type };
}

/** Forget typed text kept for a cell (e.g. after a row is removed and indices shift). */
export function forgetPendingText(prefix: string): void {
  for (const key of [...pendingText.keys()]) if (key.startsWith(prefix)) pendingText.delete(key);
}
