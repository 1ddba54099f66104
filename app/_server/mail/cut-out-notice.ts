// The cut-out notice: tells the fuser their joint was cut out and must be remade, linking
// to the joint's own page (every signed-in person may open it; a fuser may not open Review).
import "server-only";
import type { Db } from "@/database/client";
import { findCutOutNoticeFacts, insertNotification } from "@/database/queries/outbox";
import { mailLinkPath } from "@/domain/mail/links";
import { publicUrl } from "./public-url";

/** Keeps the notice for the fuser (dedupe key `joint-cut-out:<jointId>`). Call it in the decision's transaction. */
export async function enqueueCutOutNotice({ jointId, reason, inspectorName }: { jointId: number; reason: string; inspectorName: string }, trx?: Db): Promise<{ queued: number }> {
  const row = await findCutOutNoticeFacts({ jointId }, trx);
  if (!row) return { queued: 0 };
  const label = `${row.jobCode} joint ${row.jointNo}`;
  const linkPath = mailLinkPath({ kind: "cut-out", jointId: row.id }, row.fuser);
  const result = await insertNotification(
    {
      userId: row.fuser.id,
      subject: `Cut out: ${label} must be remade`,
      bodyText: [
        `${inspectorName} cut out ${label}${row.station ? ` at station ${row.station}` : ""} (${row.jobName}).`,
        "",
        `Reason: ${reason}`,
        "",
        "Remake the joint and record the remake as replacing this one on the Trench screen.",
        `Details: ${publicUrl()}${linkPath}`,
      ].join("\n"),
      linkPath,
      kind: "joint-cut-out",
      dedupeKey: `joint-cut-out:${row.id}`,
    },
    trx,
  );
  return { queued: result.queued ? 1 : 0 };
}
