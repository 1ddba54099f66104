// Names the service worker (app/sw.ts) and the pages share: where the worker lives, the
// caches it fills, and the device-storage keys of the Trench screen. Plain constants, used
// by the worker bundle and by the browser alike.

/** The service worker's script, built by Serwist from app/sw.ts (route app/serwist/[path]). */
export const SERVICE_WORKER_URL = "/serwist/sw.js";

/** The page shown for a page that needs a connection when there is none (precached). */
export const OFFLINE_PAGE_PATH = "/~offline";

/** The one screen kept for use without signal. */
export const TRENCH_PATH = "/trench";

/**
 * The cached Trench page: its HTML carries the fuser's jobs, machines, heater plates,
 * procedures and the crew's coils. Network first; emptied at sign-out, when another person
 * signs in on the device, and when the server no longer gives the page to this session.
 */
export const TRENCH_CACHE = "beadline-trench";

/** Build files (scripts, styles, fonts) that are not in the precache list: no personal data. */
export const STATIC_CACHE = "beadline-static";

/** Which person's Trench page the device keeps (localStorage), so another person's is never shown. */
export const OFFLINE_OWNER_KEY = "beadline.offline.owner";

/** Sent on the window when the Trench page has been saved on the device. */
export const TRENCH_KEPT_EVENT = "beadline:trench-kept";

/** Everything the Trench screen keeps on the device starts with this (localStorage and IndexedDB). */
export const TRENCH_KEY_PREFIX = "beadline.trench.";
export const trenchDraftKey = (userId: number) => `${TRENCH_KEY_PREFIX}draft.${userId}`;
export const trenchOutboxKey = (userId: number) => `${TRENCH_KEY_PREFIX}outbox.${userId}`;
export const trenchRememberKey = (userId: number) => `${TRENCH_KEY_PREFIX}last.${userId}`;
export const trenchPhotoKeyPrefix = `${TRENCH_KEY_PREFIX}photo.`;
