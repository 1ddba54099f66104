"use client";
// The fuser's open work on this device: the Trench screen keeps its draft and the outbox
// of joints waiting to be sent in this browser (localStorage keys "beadline.trench.…"),
// so only the browser can show them.
import Link from "next/link";
import { useSyncExternalStore } from "react";
import { formatInstant } from "@/components/ui/display-format";
import { useTimeZone } from "@/components/ui/time-zone";

const PREFIX = "beadline.trench.";

type DeviceWork = { draftSavedAt: string | null; outbox: { label: string; state: string; message: string | null }[] };

function read(userId: number): string {
  try {
    const draft = JSON.parse(window.localStorage.getItem(`${PREFIX}draft.${userId}`) ?? "null") as { savedAt?: string } | null;
    const outbox = JSON.parse(window.localStorage.getItem(`${PREFIX}outbox.${userId}`) ?? "[]") as { label?: string; state?: string; message?: string | null }[];
    const work: DeviceWork = {
      draftSavedAt: draft ? (draft.savedAt ?? "") : null,
      outbox: Array.isArray(outbox) ? outbox.filter((e) => e && e.state !== "sent").map((e) => ({ label: String(e.label ?? "Joint"), state: String(e.state ?? "waiting"), message: e.message ?? null })) : [],
    };
    return JSON.stringify(work);
  } catch {
    return JSON.stringify({ draftSavedAt: null, outbox: [] });
  }
}

const subscribe = (onChange: () => void) => {
  window.addEventListener("storage", onChange);
  return () => window.removeEventListener("storage", onChange);
};

const STATE_WORDS: Record<string, string> = { waiting: "waiting to send", sending: "sending", refused: "refused" };

export function TodayDrafts({ userId }: { userId: number }) {
  const timeZone = useTimeZone();
  // A string snapshot keeps useSyncExternalStore stable between renders.
  const snapshot = useSyncExternalStore(subscribe, () => read(userId), () => "server");
  if (snapshot === "server") return <p>Looking for drafts on this device …</p>;
  const work = JSON.parse(snapshot) as DeviceWork;
  if (work.draftSavedAt === null && work.outbox.length === 0) return <p>No drafts on this device.</p>;
  return (
    <ul className="flex flex-col gap-1">
      {work.draftSavedAt !== null ? (
        <li>
          <Link href="/trench" className="inline-flex min-h-touch items-center font-semibold text-brand underline">
            A joint in progress
          </Link>
          {work.draftSavedAt && !Number.isNaN(Date.parse(work.draftSavedAt)) ? ` (saved ${formatInstant(work.draftSavedAt, "minute", timeZone)})` : ""}
        </li>
      ) : null}
      {work.outbox.map((e, i) => (
        <li key={i}>
          {e.label}: <span className={e.state === "refused" ? "font-semibold text-fail" : "font-semibold"}>{STATE_WORDS[e.state] ?? e.state}</span>
          {e.message ? ` — ${e.message}` : ""}
        </li>
      ))}
    </ul>
  );
}
