import { onScopeDispose, watchEffect, type MaybeRefOrGetter, toValue } from 'vue';
import { pageTitle } from '@/router/guards';

/**
 * Keeps the browser tab's title in step with a page's own title (a sheet's name, say); the
 * router sets the route's static title on every navigation.
 */
export function usePageTitle(title: MaybeRefOrGetter<string | undefined>): void {
  const stop = watchEffect(() => {
    const text = toValue(title);
    if (text) document.title = pageTitle(text);
  });
  onScopeDispose(stop);
}
