"use client";
// The instant result of the joint just recorded: the device's own check at once, the
// server's verdict once it arrives (the server's is the record). Out of limits: cut it out
// and remake it per the procedure; the remake links to the joint it replaces. A joint whose
// submission id had already recorded another joint shows that instead of any verdict.
import Link from "next/link";
import { Button } from "@/components/ui/button";
import type { OutboxEntry } from "../_client/device-store";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";
import { ReusedIdNotice } from "./reused-id-notice";

export function ResultPanel({
  entry,
  onRemake,
  onDismiss,
  onSendAsNew,
  onRemove,
}: {
  entry: OutboxEntry;
  onRemake: (entry: OutboxEntry) => void;
  onDismiss: () => void;
  onSendAsNew: (key: string) => void;
  onRemove: (key: string) => void;
}) {
  if (entry.state === "refused" && entry.isReusedId) return <ReusedIdNotice entry={entry} onSendAsNew={onSendAsNew} onRemove={onRemove} />;
  const result = entry.result;
  const outcome = result?.outcome ?? entry.preliminary?.outcome ?? null;
  const within = outcome === "within-limits";
  const findings = result ? result.findings.map((f) => f.message) : (entry.preliminary?.findings ?? []);
  return (
    <section aria-labelledby="result-heading" className={`flex flex-col gap-2 rounded-md border-4 p-4 ${within ? "border-pass bg-pass-light" : "border-fail bg-fail-light"}`} tabIndex={-1}>
      <h2 id="result-heading" className={`text-2xl font-bold ${within ? "text-pass" : "text-fail"}`}>
        {result ? `Joint ${result.jointNo} on ${result.jobCode}: ` : "This joint: "}
        {OUTCOME_LABELS[within ? "within-limits" : "out-of-limits"]}
      </h2>
      <p className="font-semibold text-ink">
        {result
          ? "Checked by Beadline's server against the job's procedure; this is the record."
          : entry.state === "refused"
            ? `Not recorded: ${entry.message ?? "refused by the server."}`
            : "Checked on this device. It is waiting to be sent; the server checks it again and its verdict is the record."}
      </p>
      {findings.length ? (
        <ul className="list-disc pl-5 text-ink">
          {findings.map((f) => (
            <li key={f}>{f}</li>
          ))}
        </ul>
      ) : null}
      {result ? <p className="text-ink">{result.advice}</p> : !within ? <p className="text-ink">Cut this joint out and remake it per the procedure.</p> : null}
      {result?.warnings?.length ? (
        <div role="note" aria-label="Handling warnings" className="rounded-md border-2 border-caution bg-white p-2 text-ink">
          <p className="font-bold">Caution: handling wait</p>
          <ul className="list-disc pl-5">
            {result.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </div>
      ) : null}
      <div className="flex flex-wrap gap-2">
        {result ? (
          <Link href={result.url} className="inline-flex min-h-touch items-center rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
            Open joint {result.jointNo}
          </Link>
        ) : null}
        {result && result.outcome === "out-of-limits" ? (
          <Button type="button" onClick={() => onRemake(entry)}>
            Record the remake of joint {result.jointNo}
          </Button>
        ) : null}
        <Button type="button" variant="ghost" onClick={onDismiss}>
          Hide this result
        </Button>
      </div>
    </section>
  );
}
