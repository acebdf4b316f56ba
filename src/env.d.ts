/// <reference types="vite/client" />

import 'vue-router';

declare module 'vue-router' {
  interface RouteMeta {
    /** Shown in the browser tab as "<title> · Meander". */
    title?: string;
    /** Reachable without signing in. */
    public?: boolean;
    /** Only for signed-out people (sign-in, sign-up): signed-in people go on to their sheets. */
    guestOnly?: boolean;
    /** Needs the site role admin. */
    requiresAdmin?: boolean;
  }
}
