"use client";
// What is waiting on this device, what was sent and what was refused and why — in words.
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { entryKey, type OutboxEntry } from "../_client/device-store";
import { differenceMessages, ReusedIdActions } from "./reused-id-notice";
import { formatInstant } from "@/components/ui/display-format";
import { useTimeZone } from "@/components/ui/time-zone";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";

const STATE_WORDS: Record<OutboxEntry["state"], string> = {
  waiting: "Waiting to send",
  sending: "Sending",
  sent: "Sent",
  refused: "Refused",
};

const STATE_STYLE: Record<OutboxEntry["state"], string> = {
  waiting: "border-caution bg-caution-light text-caution",
  sending: "border-brand bg-brand-light text-brand-dark",
  sent: "border-pass bg-pass-light text-pass",
  refused: "border-fail bg-fail-light text-fail",
};

export function OutboxPanel({
  entries,
  online,
  onRetry,
  onSendAsNew,
  onRemove,
  onSendNow,
}: {
  entries: OutboxEntry[];
  online: boolean;
  onRetry: (key: string) => void;
  onSendAsNew: (key: string) => void;
  onRemove: (key: string) => void;
  onSendNow: () => void;
}) {
  const timeZone = useTimeZone();
  const waiting = entries.filter((e) => e.state === "waiting" || e.state === "sending").length;
  const shown = [...entries].reverse().slice(0, 12);
  return (
    <section aria-labelledby="outbox-heading" className="flex flex-col gap-2">
      <h2 id="outbox-heading" className="text-xl font-bold">
        Outbox on this device
      </h2>
      <p role="status" aria-live="polite" className={`rounded-md border-2 px-3 py-2 font-semibold ${online ? "border-slate-300 bg-white text-ink" : "border-caution bg-caution-light text-caution"}`}>
        {online ? "Connected." : "No signal: joints you record are kept on this device and sent when the connection is back."}{" "}
        {waiting === 0 ? "Nothing is waiting to be sent." : `${waiting} joint${waiting === 1 ? " is" : "s are"} waiting to be sent.`}
      </p>
      {waiting > 0 && online ? (
        <Button type="button" variant="secondary" onClick={onSendNow}>
          Send waiting joints now
        </Button>
      ) : null}
      <ul className="flex flex-col gap-2" aria-label="Joints on this device">
        {shown.map((e) => (
          <li key={entryKey(e)} className={`rounded-md border-2 p-3 ${STATE_STYLE[e.state]}`} aria-label={`${STATE_WORDS[e.state]}: ${e.jobCode ?? ""} ${e.label}`}>
            <p className="font-bold">
              {STATE_WORDS[e.state]}
              {e.result ? `: joint ${e.result.jointNo} on ${e.result.jobCode}` : ` · ${e.jobCode ?? ""}`} · {e.label}
            </p>
            <p className="text-sm">Recorded {formatInstant(e.createdAt, "minute", timeZone)}</p>
            {e.result ? (
              <p className="text-sm font-semibold">
                {e.result.outcome === "within-limits" ? OUTCOME_LABELS["within-limits"] : `${OUTCOME_LABELS["out-of-limits"]}: ${e.result.findings.map((f) => f.message).join("; ")}`} ·{" "}
                <Link className="underline" href={e.result.url}>
                  Open joint {e.result.jointNo}
                </Link>
              </p>
            ) : null}
            {e.message ? <p className="text-sm font-semibold">{e.message}</p> : null}
            {e.fields && e.state === "refused" ? (
              <ul className="list-disc pl-5 text-sm">
                {/* The server's sentences name each field in words; the internal key is not shown. */}
                {differenceMessages(e).map((m) => (
                  <li key={m}>{m}</li>
                ))}
              </ul>
            ) : null}
            {e.state === "refused" && e.isReusedId ? (
              <>
                <p className="text-sm">The values you entered are kept here. Send them as a new joint if this is a joint of its own.</p>
                <ReusedIdActions entry={e} onSendAsNew={onSendAsNew} onRemove={onRemove} />
              </>
            ) : e.state === "refused" ? (
              <div className="mt-2 flex flex-wrap gap-2">
                <Button type="button" variant="secondary" onClick={() => onRetry(entryKey(e))}>
                  Send again unchanged
                </Button>
                <Button type="button" variant="ghost" onClick={() => onRemove(entryKey(e))}>
                  Discard this joint from the device
                </Button>
              </div>
            ) : null}
          </li>
        ))}
      </ul>
    </section>
  );
}
