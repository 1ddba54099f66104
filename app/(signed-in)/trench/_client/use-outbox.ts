"use client";
// The device's outbox: joints recorded at the trench wait here until they reach the
// server. Sending starts at once, again when the browser says the connection is back
// ('online' event), and every 15 s while something waits. Each submission carries its
// client id, so a retry after a timeout returns the joint already made instead of a
// second one. Photos upload first (their ids are kept, so a retry does not upload twice).
// A client id that already recorded a joint with other values (a draft recorded in two
// tabs) is refused by the server (409); the entry keeps its values and can be sent as a new
// joint under a fresh client id. Entries are told apart by their own local id, so the two
// never overwrite each other.
import { useCallback, useEffect, useRef, useState } from "react";
import type { RecordedJoint } from "@/app/_server/joints/record-joint";
import { dropPhoto, entryKey, loadOutbox, outboxKey, readPhoto, saveOutbox, type OutboxEntry } from "./device-store";

const RETRY_MS = 15_000;
const REQUEST_TIMEOUT_MS = 30_000;

type ApiError = { error?: { code?: string; message?: string; fields?: Record<string, string[]> } };

class Offline extends Error {}

async function fetchWithTimeout(url: string, init: RequestInit): Promise<Response> {
  const controller = new AbortController();
  const timer = setTimeout(() => controller.abort(), REQUEST_TIMEOUT_MS);
  try {
    return await fetch(url, { ...init, signal: controller.signal, credentials: "same-origin" });
  } catch {
    throw new Offline("No connection to Beadline.");
  } finally {
    clearTimeout(timer);
  }
}

/** Statuses that mean "the server looked and said no": retrying the same thing will not help. */
const REFUSED = new Set([400, 403, 404, 409, 413, 415, 422]);

export function useOutbox(userId: number, onSent?: (entry: OutboxEntry) => void) {
  const [entries, setEntries] = useState<OutboxEntry[]>([]);
  const [online, setOnline] = useState(true);
  const entriesRef = useRef<OutboxEntry[]>([]);
  const busy = useRef(false);
  const sentListener = useRef(onSent);
  useEffect(() => {
    sentListener.current = onSent;
  }, [onSent]);

  const commit = useCallback(
    (next: OutboxEntry[]) => {
      entriesRef.current = next;
      saveOutbox(userId, next);
      setEntries(next);
    },
    [userId],
  );

  const update = useCallback(
    (key: string, patch: Partial<OutboxEntry>) => {
      // Re-read storage first: another tab may have changed other entries meanwhile.
      const current = loadOutbox(userId);
      const base = current.some((e) => entryKey(e) === key) ? current : entriesRef.current;
      commit(base.map((e) => (entryKey(e) === key ? { ...e, ...patch } : e)));
    },
    [commit, userId],
  );

  const sendOne = useCallback(
    async (entry: OutboxEntry): Promise<"sent" | "refused" | "waiting"> => {
      const key = entryKey(entry);
      update(key, { state: "sending", attempts: entry.attempts + 1, lastTriedAt: new Date().toISOString(), message: "Sending …" });
      try {
        const photos = [...entry.photos];
        for (let i = 0; i < photos.length; i += 1) {
          const ref = photos[i]!;
          if (ref.uploadedId !== null) continue;
          const blob = await readPhoto(ref);
          if (!blob) continue; // lost from this device's storage: send the joint without it
          const form = new FormData();
          form.set("kind", "bead-photo");
          form.set("file", blob, ref.name);
          const r = await fetchWithTimeout("/api/v1/attachments", { method: "POST", body: form });
          if (r.status === 401) throw new Offline("Signed out: sign in again and the joint will be sent.");
          const body = (await r.json().catch(() => ({}))) as ApiError & { attachment?: { id: number } };
          if (!r.ok) {
            if (REFUSED.has(r.status)) {
              update(key, { state: "refused", photos, message: `Photo "${ref.name}" was refused: ${body.error?.message ?? r.statusText}`, fields: body.error?.fields });
              return "refused";
            }
            throw new Offline(body.error?.message ?? `The server answered ${r.status}; will try again.`);
          }
          photos[i] = { ...ref, uploadedId: body.attachment!.id };
          update(key, { photos });
        }
        const photoIds = photos.map((p) => p.uploadedId).filter((id): id is number => id !== null);
        const r = await fetchWithTimeout("/api/v1/joints", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ ...entry.payload, photoIds }) });
        if (r.status === 401) throw new Offline("Signed out: sign in again and the joint will be sent.");
        const body = (await r.json().catch(() => ({}))) as ApiError & { joint?: RecordedJoint };
        if (r.ok && body.joint) {
          update(key, { state: "sent", photos, result: body.joint, message: null, fields: undefined, isReusedId: false });
          for (const ref of photos) void dropPhoto(ref);
          sentListener.current?.({ ...entry, state: "sent", result: body.joint });
          return "sent";
        }
        if (REFUSED.has(r.status)) {
          // 409 naming the client id: that id already recorded another joint (or another person's).
          const isReusedId = r.status === 409 && Boolean(body.error?.fields?.clientId);
          update(key, { state: "refused", photos, message: body.error?.message ?? `Refused (${r.status}).`, fields: body.error?.fields, isReusedId });
          return "refused";
        }
        throw new Offline(body.error?.message ?? `The server answered ${r.status}; will try again.`);
      } catch (error) {
        const message = error instanceof Offline ? error.message : "Could not send; will try again.";
        update(key, { state: "waiting", message: navigator.onLine ? `${message} Next try in ${RETRY_MS / 1000} s.` : "No signal: waiting to send. It goes as soon as the connection is back." });
        return "waiting";
      }
    },
    [update],
  );

  const sendWaiting = useCallback(async () => {
    if (busy.current) return;
    busy.current = true;
    try {
      const queue = loadOutbox(userId);
      commit(queue);
      for (const entry of queue) {
        if (entry.state !== "waiting" && entry.state !== "sending") continue;
        if (!navigator.onLine) {
          update(entryKey(entry), { state: "waiting", message: "No signal: waiting to send. It goes as soon as the connection is back." });
          continue;
        }
        const outcome = await sendOne(entry);
        if (outcome === "waiting") break; // the connection is poor: keep the order, try later
      }
    } finally {
      busy.current = false;
    }
  }, [commit, sendOne, update, userId]);

  useEffect(() => {
    // Device storage is an external system: read it once the page is on the device.
    // eslint-disable-next-line react-hooks/set-state-in-effect
    commit(loadOutbox(userId));
    setOnline(navigator.onLine);
    const goOnline = () => {
      setOnline(true);
      void sendWaiting();
    };
    const goOffline = () => setOnline(false);
    const fromOtherTab = (e: StorageEvent) => {
      if (e.key === outboxKey(userId)) commit(loadOutbox(userId));
    };
    window.addEventListener("online", goOnline);
    window.addEventListener("offline", goOffline);
    window.addEventListener("storage", fromOtherTab);
    const timer = window.setInterval(() => {
      if (entriesRef.current.some((e) => e.state === "waiting" || e.state === "sending")) void sendWaiting();
    }, RETRY_MS);
    void sendWaiting();
    return () => {
      window.removeEventListener("online", goOnline);
      window.removeEventListener("offline", goOffline);
      window.removeEventListener("storage", fromOtherTab);
      window.clearInterval(timer);
    };
  }, [commit, sendWaiting, userId]);

  const enqueue = useCallback(
    (entry: OutboxEntry) => {
      commit([...loadOutbox(userId).filter((e) => entryKey(e) !== entryKey(entry)), entry]);
      void sendWaiting();
    },
    [commit, sendWaiting, userId],
  );

  /** Send a refused entry again unchanged (e.g. after an inspector cleared a block). */
  const retry = useCallback(
    (key: string) => {
      update(key, { state: "waiting", message: "Waiting to send …" });
      void sendWaiting();
    },
    [sendWaiting, update],
  );

  /**
   * Send a refused entry as a new joint: the same values (made at the same moment) under a
   * fresh client id, for an entry whose id had already recorded another joint.
   */
  const sendAsNew = useCallback(
    (key: string) => {
      const entry = loadOutbox(userId).find((e) => entryKey(e) === key) ?? entriesRef.current.find((e) => entryKey(e) === key);
      if (!entry) return;
      const clientId = crypto.randomUUID();
      update(key, { localId: key, clientId, payload: { ...entry.payload, clientId }, state: "waiting", isReusedId: false, fields: undefined, message: "Waiting to send as a new joint …" });
      void sendWaiting();
    },
    [sendWaiting, update, userId],
  );

  const remove = useCallback(
    (key: string) => {
      const entry = entriesRef.current.find((e) => entryKey(e) === key);
      for (const ref of entry?.photos ?? []) void dropPhoto(ref);
      commit(loadOutbox(userId).filter((e) => entryKey(e) !== key));
    },
    [commit, userId],
  );

  return { entries, online, enqueue, retry, sendAsNew, remove, sendNow: sendWaiting };
}
