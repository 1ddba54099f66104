// What sign-out does to the device: the service worker's caches and the Trench screen's
// stored data go (drafts, remembered choices, sent joints, photos of nothing unsent), the
// service worker is unregistered; joints not yet sent stay in the outbox, with their photos,
// and go when the same person signs in again. Browser-only module.
import { delMany, keys } from "idb-keyval";
import { OFFLINE_OWNER_KEY, TRENCH_KEY_PREFIX, trenchOutboxKey, trenchPhotoKeyPrefix } from "./names";

const OUTBOX_PREFIX = `${TRENCH_KEY_PREFIX}outbox.`;

type StoredEntry = { clientId?: string; label?: string; jobCode?: string; state?: string; photos?: { key?: string }[] };

/** A joint recorded on this device that has not reached Beadline (waiting, being sent, or refused). */
export type UnsentJoint = { clientId: string; label: string; jobCode: string; isRefused: boolean };

function readOutbox(key: string): StoredEntry[] {
  try {
    const parsed = JSON.parse(window.localStorage.getItem(key) ?? "[]") as unknown;
    return Array.isArray(parsed) ? (parsed as StoredEntry[]) : [];
  } catch {
    return [];
  }
}

const isUnsent = (e: StoredEntry) => e.state !== "sent";

/** The joints on this device that this person recorded and that have not reached the server. */
export function unsentJointsOnDevice(userId: number): UnsentJoint[] {
  if (typeof window === "undefined") return [];
  return readOutbox(trenchOutboxKey(userId))
    .filter(isUnsent)
    .map((e) => ({ clientId: String(e.clientId ?? ""), label: String(e.label ?? ""), jobCode: String(e.jobCode ?? ""), isRefused: e.state === "refused" }));
}

async function deleteAllCaches(): Promise<number> {
  const names = await caches.keys();
  await Promise.all(names.map((n) => caches.delete(n)));
  return names.length;
}

/**
 * Unregisters this origin's service workers, then deletes every cache. A worker still
 * finishing a fetch it took before (the Trench page's network-first copy is written just
 * after the page is answered) can write that copy after the first delete: the caches are
 * looked at again for a moment and anything that came back is deleted too.
 */
export async function forgetOfflineCopies(): Promise<void> {
  if ("serviceWorker" in navigator) {
    const registrations = await navigator.serviceWorker.getRegistrations();
    await Promise.all(registrations.map((r) => r.unregister()));
  }
  if (!("caches" in window)) return;
  await deleteAllCaches();
  for (let i = 0; i < 4; i += 1) {
    await new Promise((resolve) => window.setTimeout(resolve, 250));
    await deleteAllCaches();
  }
}

/** Sign-out: clears the caches and the Trench screen's stored data, keeping unsent joints. */
export async function forgetDeviceData(): Promise<void> {
  const keptPhotos = new Set<string>();
  for (const key of Object.keys(window.localStorage)) {
    if (key === OFFLINE_OWNER_KEY) {
      window.localStorage.removeItem(key);
      continue;
    }
    if (!key.startsWith(TRENCH_KEY_PREFIX)) continue;
    if (!key.startsWith(OUTBOX_PREFIX)) {
      window.localStorage.removeItem(key);
      continue;
    }
    const unsent = readOutbox(key).filter(isUnsent);
    for (const e of unsent) for (const p of e.photos ?? []) if (p.key) keptPhotos.add(p.key);
    if (unsent.length) window.localStorage.setItem(key, JSON.stringify(unsent));
    else window.localStorage.removeItem(key);
  }
  try {
    const stored = (await keys()).map(String).filter((k) => k.startsWith(trenchPhotoKeyPrefix) && !keptPhotos.has(k));
    if (stored.length) await delMany(stored);
  } catch {
    // IndexedDB unavailable (private mode): nothing was stored there.
  }
  await forgetOfflineCopies();
}
