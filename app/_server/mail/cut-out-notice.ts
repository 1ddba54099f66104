// The cut-out notice: tells the fuser their joint was cut out and must be remade.
import "server-only";
import type { Db } from "@/database/client";
import { enqueueUserEvent, findCutOutNoticeFacts } from "@/database/queries/outbox";
import { publicUrl } from "./public-url";

/** Queues the notice (dedupe key `joint-cut-out:<jointId>`). Call it in the decision's transaction. */
export async function enqueueCutOutNotice({ jointId, reason, inspectorName }: { jointId: number; reason: string; inspectorName: string }, trx?: Db): Promise<{ queued: number }> {
  const row = await findCutOutNoticeFacts({ jointId }, trx);
  if (!row) return { queued: 0 };
  const label = `${row.jobCode} joint ${row.jointNo}`;
  const result = await enqueueUserEvent(
    {
      recipient: row.fuser,
      subject: `Cut out: ${label} must be remade`,
      bodyText: [
        `${inspectorName} cut out ${label}${row.station ? ` at station ${row.station}` : ""} (${row.jobName}).`,
        "",
        `Reason: ${reason}`,
        "",
        "Remake the joint and record the remake as replacing this one on the Trench screen.",
        `Details: ${publicUrl()}/review?joint=${row.id}`,
      ].join("\n"),
      kind: "joint-cut-out",
      dedupeKey: `joint-cut-out:${row.id}`,
    },
    trx,
  );
  return { queued: result.queued ? 1 : 0 };
}
