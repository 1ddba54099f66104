// Beadline's service worker, built by Serwist (@serwist/turbopack, route app/serwist/[path]).
// What it keeps: the build's scripts and styles (precached: no personal data), the
// "needs a connection" page, and the Trench page of the signed-in fuser (network first, so
// it is refreshed on every load with signal; the page's HTML carries its jobs, machines,
// heater plates, procedures and the crew's coils). Nothing else: other pages and every API
// answer go to the network only, and a page that fails without signal gets the offline page.
/// <reference lib="webworker" />
import { CacheFirst, ExpirationPlugin, NetworkFirst, NetworkOnly, Serwist, type PrecacheEntry, type SerwistGlobalConfig, type SerwistPlugin } from "serwist";
import { OFFLINE_PAGE_PATH, STATIC_CACHE, TRENCH_CACHE, TRENCH_PATH } from "@/components/offline/names";

declare global {
  interface WorkerGlobalScope extends SerwistGlobalConfig {
    __SW_MANIFEST: (PrecacheEntry | string)[] | undefined;
  }
}

declare const self: ServiceWorkerGlobalScope;

/** A poor signal gives up on the server after this and shows the saved Trench page. */
const TRENCH_NETWORK_TIMEOUT_S = 10;

/**
 * Only the page itself, answered 200 to this session, is saved. Any other answer (the
 * redirect to sign-in, "not found" for someone who does not record joints) means the page is
 * no longer this session's: the saved copy is dropped, so nobody else's data is ever shown.
 */
const onlyThisSessionsTrench: SerwistPlugin = {
  fetchDidSucceed: async ({ response }) => {
    if (response.status !== 200 || response.redirected || response.type === "opaqueredirect") await caches.delete(TRENCH_CACHE);
    return response;
  },
  cacheWillUpdate: async ({ response }) => (response.status === 200 && !response.redirected ? response : null),
};

const serwist = new Serwist({
  precacheEntries: self.__SW_MANIFEST,
  skipWaiting: true,
  clientsClaim: true,
  navigationPreload: true,
  disableDevLogs: true,
  runtimeCaching: [
    {
      // The Trench page as a document (a navigation or the warm-up fetch), not its React
      // Server Component requests (header RSC), which stay network only.
      matcher: ({ request, url, sameOrigin }) => sameOrigin && url.pathname === TRENCH_PATH && !request.headers.has("RSC") && !url.searchParams.has("_rsc"),
      handler: new NetworkFirst({
        cacheName: TRENCH_CACHE,
        networkTimeoutSeconds: TRENCH_NETWORK_TIMEOUT_S,
        matchOptions: { ignoreVary: true },
        plugins: [onlyThisSessionsTrench],
      }),
    },
    {
      // Build files with hashed names that are not in the precache list (late chunks).
      matcher: ({ url, sameOrigin }) => sameOrigin && url.pathname.startsWith("/_next/static/"),
      handler: new CacheFirst({ cacheName: STATIC_CACHE, plugins: [new ExpirationPlugin({ maxEntries: 200 })] }),
    },
    {
      // Every other page: the network, or the offline page when there is none.
      matcher: ({ request }) => request.mode === "navigate",
      handler: new NetworkOnly(),
    },
  ],
  fallbacks: {
    entries: [{ url: OFFLINE_PAGE_PATH, matcher: ({ request }) => request.destination === "document" }],
  },
});

serwist.addEventListeners();
