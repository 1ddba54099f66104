"use client";
// A joint refused because its submission id had already recorded another joint (the same
// draft recorded in two tabs, or a restored draft): what the server said, which values
// differ, that the values are still on this device, and the way on — send it as a new joint
// (a fresh submission id) or discard it.
import { Button } from "@/components/ui/button";
import { entryKey, type OutboxEntry } from "../_client/device-store";

/** The server's per-field sentences, less the client id's (it repeats the message). */
export function differenceMessages(entry: OutboxEntry): string[] {
  return Object.entries(entry.fields ?? {})
    .filter(([k]) => k !== "clientId" && k !== "_form" && k !== "override")
    .flatMap(([, v]) => v);
}

export function ReusedIdActions({ entry, onSendAsNew, onRemove }: { entry: OutboxEntry; onSendAsNew: (key: string) => void; onRemove: (key: string) => void }) {
  const key = entryKey(entry);
  return (
    <div className="mt-2 flex flex-wrap gap-2">
      <Button type="button" onClick={() => onSendAsNew(key)}>
        Send as a new joint
      </Button>
      <Button type="button" variant="ghost" onClick={() => onRemove(key)}>
        Discard this joint from the device
      </Button>
    </div>
  );
}

export function ReusedIdNotice({ entry, onSendAsNew, onRemove }: { entry: OutboxEntry; onSendAsNew: (key: string) => void; onRemove: (key: string) => void }) {
  const differences = differenceMessages(entry);
  return (
    <section aria-labelledby="result-heading" className="flex flex-col gap-2 rounded-md border-4 border-caution bg-caution-light p-4" tabIndex={-1}>
      <h2 id="result-heading" className="text-2xl font-bold text-caution">
        Not recorded: this draft&apos;s submission id was already used
      </h2>
      <p role="alert" className="font-semibold text-ink">
        {entry.message}
      </p>
      {differences.length ? (
        <ul className="list-disc pl-5 text-ink" aria-label="Values that differ from the joint already recorded">
          {differences.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      ) : null}
      <p className="text-ink">
        This joint ({entry.label}) is kept on this device with the values you entered. If it is a joint of its own, send it as a new joint; if it is the same joint recorded twice, discard it.
      </p>
      <ReusedIdActions entry={entry} onSendAsNew={onSendAsNew} onRemove={onRemove} />
    </section>
  );
}
