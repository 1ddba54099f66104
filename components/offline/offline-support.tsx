"use client";
// Registers Beadline's service worker (Serwist, built from app/sw.ts) for a signed-in person
// and, for someone who records joints, has it save the Trench screen, so the screen opens
// without signal after one signed-in visit to any page. The saved copy belongs to one
// person: when someone else signs in on the device it is dropped first.
import { messageSW, Serwist } from "@serwist/window";
import { useEffect } from "react";
import { OFFLINE_OWNER_KEY, SERVICE_WORKER_URL, TRENCH_CACHE, TRENCH_KEPT_EVENT, TRENCH_PATH } from "./names";

/** A saved copy younger than this is not fetched again from another page. */
const REFRESH_AFTER_MS = 5 * 60_000;

async function savedAt(): Promise<number | null> {
  const saved = await caches.match(TRENCH_PATH, { cacheName: TRENCH_CACHE, ignoreVary: true });
  const date = saved?.headers.get("date");
  return saved ? (date ? Date.parse(date) : 0) : null;
}

async function keepTrench(): Promise<void> {
  const controlled = Boolean(navigator.serviceWorker.controller);
  const age = await savedAt();
  // On the Trench page under a worker, the page's own load has just refreshed the copy.
  const fresh = age !== null && (Date.now() - age < REFRESH_AFTER_MS || (controlled && window.location.pathname === TRENCH_PATH));
  if (!fresh && navigator.onLine) {
    const registration = await navigator.serviceWorker.ready;
    if (registration.active) await messageSW(registration.active, { type: "CACHE_URLS", payload: { urlsToCache: [TRENCH_PATH] } });
  }
  // The worker answers once the page is fetched; its copy is written just after: look a few times.
  for (let i = 0; i < 20; i += 1) {
    if ((await savedAt()) !== null) {
      window.dispatchEvent(new Event(TRENCH_KEPT_EVENT));
      return;
    }
    await new Promise((resolve) => window.setTimeout(resolve, 250));
  }
}

export function OfflineSupport({ userId, keepsTrench }: { userId: number; keepsTrench: boolean }) {
  useEffect(() => {
    if (!("serviceWorker" in navigator) || !("caches" in window)) return;
    void (async () => {
      if (window.localStorage.getItem(OFFLINE_OWNER_KEY) !== String(userId) || !keepsTrench) {
        await caches.delete(TRENCH_CACHE);
        window.localStorage.setItem(OFFLINE_OWNER_KEY, String(userId));
      }
      await new Serwist(SERVICE_WORKER_URL, { scope: "/", type: "module" }).register({ immediate: true });
      if (keepsTrench) await keepTrench();
    })().catch(() => {
      // No worker (blocked, private mode): the screens work online as before.
    });
  }, [userId, keepsTrench]);
  return null;
}
