import { onScopeDispose } from 'vue';

/** Calls `callback` once `delayMs` has passed without another call (remote search as one types). */
export function useDebouncedCallback<A extends unknown[]>(callback: (...args: A) => void, delayMs: number) {
  let timer: ReturnType<typeof setTimeout> | undefined;

  function cancel(): void {
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
  }

  function call(...args: A): void {
    cancel();
    timer = setTimeout(() => {
      timer = undefined;
      callback(...args);
    }, delayMs);
  }

  onScopeDispose(cancel);
  return { call, cancel };
}
