"use client";
// "Sign out" that also clears what the device keeps for offline use (caches, the Trench
// screen's stored data) but never a joint that has not reached Beadline: if any wait in the
// outbox, it says so first and lets the person stay signed in until they are sent.
import { useRef, useState, useTransition } from "react";
import { Button } from "@/components/ui/button";
import { forgetDeviceData, unsentJointsOnDevice, type UnsentJoint } from "./device-data";

/** Any answer from the server (even "signed out") means sign-out can reach it. */
async function reachesBeadline(): Promise<boolean> {
  try {
    await fetch("/api/v1/session", { cache: "no-store", credentials: "same-origin" });
    return true;
  } catch {
    return false;
  }
}

export function SignOutButton({ userId, signOut }: { userId: number; signOut: () => Promise<void> }) {
  const dialog = useRef<HTMLDialogElement>(null);
  const [unsent, setUnsent] = useState<UnsentJoint[]>([]);
  const [problem, setProblem] = useState<string | null>(null);
  const [pending, startSignOut] = useTransition();

  const leave = () =>
    startSignOut(async () => {
      dialog.current?.close();
      setProblem(null);
      // Without signal the server cannot end the session: clear nothing, or the Trench screen
      // would be gone from the device while the person is still signed in.
      if (!(await reachesBeadline())) {
        setProblem("No signal: signing out needs a connection. Nothing was cleared.");
        return;
      }
      await forgetDeviceData().catch(() => undefined);
      await signOut();
    });

  const onClick = () => {
    const waiting = unsentJointsOnDevice(userId);
    if (waiting.length === 0) return leave();
    setUnsent(waiting);
    dialog.current?.showModal();
  };

  const refused = unsent.filter((j) => j.isRefused).length;
  return (
    <>
      <button type="button" onClick={onClick} disabled={pending} className="min-h-touch rounded-md border-2 border-white px-3 font-semibold hover:bg-brand-dark">
        {pending ? "Signing out …" : "Sign out"}
      </button>
      {problem ? (
        <p role="alert" className="text-sm font-semibold">
          {problem}
        </p>
      ) : null}
      <dialog ref={dialog} aria-labelledby="unsent-heading" className="m-auto w-[calc(100%-2rem)] max-w-md rounded-lg border-2 border-caution bg-white p-4 text-ink backdrop:bg-black/50">
        <h2 id="unsent-heading" className="text-xl font-bold">
          {unsent.length === 1 ? "1 joint has not reached Beadline yet" : `${unsent.length} joints have not reached Beadline yet`}
        </h2>
        <ul className="my-2 list-disc pl-6">
          {unsent.map((j) => (
            <li key={j.clientId}>
              {j.jobCode} · {j.label}
              {j.isRefused ? " (refused: see the Trench screen)" : ""}
            </li>
          ))}
        </ul>
        <p>
          {refused ? "A refused joint needs your attention on the Trench screen. " : ""}
          If you sign out, {unsent.length === 1 ? "it stays" : "they stay"} on this device and {unsent.length === 1 ? "is" : "are"} sent when you sign in again here. Anything typed for a joint not yet recorded is cleared.
        </p>
        <div className="mt-4 flex flex-wrap gap-2">
          <Button type="button" onClick={() => dialog.current?.close()} autoFocus>
            Stay signed in
          </Button>
          <Button type="button" variant="secondary" onClick={leave}>
            Sign out anyway
          </Button>
        </div>
      </dialog>
    </>
  );
}
