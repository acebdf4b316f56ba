import { onScopeDispose, type Ref } from 'vue';

/**
 * Asks the browser to warn before leaving the page while there are unsaved changes. The draft is
 * in local storage already; the warning is for people who expect "leave" to mean "gone".
 */
export function useDraftUnloadGuard(dirty: Ref<boolean>): void {
  const onBeforeUnload = (event: BeforeUnloadEvent): void => {
    if (!dirty.value) return;
    event.preventDefault();
    // Older browsers show the prompt only when returnValue is set.
    event.returnValue = '';
  };
  window.addEventListener('beforeunload', onBeforeUnload);
  onScopeDispose(() => window.removeEventListener('beforeunload', onBeforeUnload));
}
