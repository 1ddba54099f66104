// The out-of-limits alert: composes the alert about a joint for each active inspector — in
// that inspector's units, with a link they may open — and keeps it as their notification,
// in the caller's transaction. The mail worker groups it into mail (fold-notifications.ts).
import "server-only";
import type { Db } from "@/database/client";
import { insertNotification, listAlertInspectors, type Recipient } from "@/database/queries/outbox";
import { findReviewItem, type ReviewItem } from "@/database/queries/reviews";
import { toQueueItemView } from "@/app/_server/review/queue-item-view";
import { formatQuantity } from "@/domain/units/format";
import { mailLinkPath } from "@/domain/mail/links";
import { publicUrl } from "./public-url";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

/** The alert's subject and text for one reader: findings and sizes in their unit system. */
export function jointAlertText(item: ReviewItem, reader: Recipient, timeZone: string): { subject: string; bodyText: string; linkPath: string } {
  const system = reader.unitSystem;
  const view = toQueueItemView(item, system);
  const findings = [...view.findings.map((f) => f.message), ...(view.trace?.findings ?? []).map((f) => `Pressure trace: ${f.message}`)];
  const label = `${item.jobCode} joint ${item.jointNo}`;
  const linkPath = mailLinkPath({ kind: "joint", jointId: item.jointId }, reader);
  const subject = `Out of limits: ${label} (${findings.length} ${findings.length === 1 ? "finding" : "findings"})`;
  const bodyText = [
    `${label} was recorded out of limits and waits for review.`,
    "",
    `Job: ${item.jobCode} ${item.jobName}`,
    `Made: ${formatInstant(item.madeAt, "minute", timeZone)} by ${item.fuserName}`,
    `Pipe: OD ${formatQuantity(item.outsideDiameterMm, "length-mm", system)}, SDR ${item.sdr}${item.machineTag ? `, machine ${item.machineTag}` : ""}${item.station ? `, station ${item.station}` : ""}`,
    "",
    "Findings:",
    ...findings.map((m) => `- ${m || "(no message)"}`),
    "",
    `${linkPath.startsWith("/review") ? "Review it" : "See the joint"}: ${publicUrl()}${linkPath}`,
  ].join("\n");
  return { subject, bodyText, linkPath };
}

/**
 * Alert for an out-of-limits joint: one notification for each active inspector (except the
 * fuser who made it, who may not review it), dedupe key `joint-alert:<jointId>:<inspectorId>`.
 * A joint within limits sends nothing. Call it inside the transaction that records the
 * joint: the alert is kept with the joint, and mail goes out later, so a mail server that
 * is down never blocks recording.
 */
export async function enqueueJointAlert({ jointId }: { jointId: number }, trx?: Db): Promise<{ queued: number }> {
  // Out of limits when recorded, or since (a pressure trace found it).
  const item = await findReviewItem({ jointId }, trx);
  if (!item || item.outcome !== "out-of-limits") return { queued: 0 };
  const timeZone = await organisationTimeZone(trx);
  let queued = 0;
  for (const inspector of await listAlertInspectors({}, trx)) {
    if (inspector.id === item.fuserId) continue;
    const text = jointAlertText(item, inspector, timeZone);
    const result = await insertNotification({ userId: inspector.id, ...text, kind: "joint-out-of-limits", dedupeKey: `joint-alert:${item.jointId}:${inspector.id}` }, trx);
    if (result.queued) queued += 1;
  }
  return { queued };
}
