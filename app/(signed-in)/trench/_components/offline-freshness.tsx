"use client";
// How fresh the Trench screen's data is, and whether the device keeps the screen for use
// without signal. The data comes with the page (loadedAt: when the server read it); a page
// shown from the device's saved copy is older, and is read again from the server as soon as
// there is signal.
import { useRouter } from "next/navigation";
import { useEffect, useState, useSyncExternalStore } from "react";
import { describeFreshness } from "@/components/offline/freshness";
import { TRENCH_CACHE, TRENCH_KEPT_EVENT, TRENCH_PATH } from "@/components/offline/names";
import { useTimeZone } from "@/components/ui/time-zone";

/** Data older than this is read again when the signal is there. */
const STALE_MS = 2 * 60_000;
const TICK_MS = 30_000;
const KEPT_LOOK_MS = 2_000;
const KEPT_LOOKS = 30;

const subscribeOnline = (onChange: () => void) => {
  window.addEventListener("online", onChange);
  window.addEventListener("offline", onChange);
  return () => {
    window.removeEventListener("online", onChange);
    window.removeEventListener("offline", onChange);
  };
};
const subscribeClock = (onChange: () => void) => {
  const timer = window.setInterval(onChange, TICK_MS);
  return () => window.clearInterval(timer);
};
const clockNow = () => Math.floor(Date.now() / TICK_MS) * TICK_MS;

export function OfflineFreshness({ loadedAt }: { loadedAt: string }) {
  const router = useRouter();
  const timeZone = useTimeZone();
  const online = useSyncExternalStore(subscribeOnline, () => navigator.onLine, () => true);
  const now = useSyncExternalStore(subscribeClock, clockNow, () => null);
  const [kept, setKept] = useState(false);
  const isStale = now !== null && now - Date.parse(loadedAt) > STALE_MS;

  // Is the screen saved on the device? Asked on arrival, when the saving says it is done, and
  // every few seconds for the first minute (the worker installs and saves in the background).
  useEffect(() => {
    if (!("caches" in window)) return;
    let tries = 0;
    const look = () =>
      void caches
        .match(TRENCH_PATH, { cacheName: TRENCH_CACHE, ignoreVary: true })
        .then((saved) => {
          setKept(Boolean(saved));
          if (saved) window.clearInterval(timer);
        })
        .catch(() => undefined);
    const timer = window.setInterval(() => (++tries > KEPT_LOOKS ? window.clearInterval(timer) : look()), KEPT_LOOK_MS);
    look();
    window.addEventListener(TRENCH_KEPT_EVENT, look);
    return () => {
      window.clearInterval(timer);
      window.removeEventListener(TRENCH_KEPT_EVENT, look);
    };
  }, [loadedAt]);

  // Shown from the saved copy and the signal is there (or came back): read it again.
  useEffect(() => {
    if (online && isStale) router.refresh();
  }, [online, isStale, router]);

  return (
    <p role="status" aria-label="Data on this screen" className={`rounded-md border-2 p-2 text-sm font-semibold ${online ? "border-slate-300 bg-white text-ink" : "border-caution bg-caution-light text-caution"}`}>
      {describeFreshness({ loadedAt, now, online, timeZone })}.{" "}
      {kept ? "Kept on this device for use without signal." : online ? "" : "Recording works; joints are sent when the signal is back."}
    </p>
  );
}
