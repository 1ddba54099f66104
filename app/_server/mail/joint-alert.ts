// The out-of-limits alert: composes the mail about a joint and queues it for each active
// inspector through the outbox, in the caller's transaction.
import "server-only";
import type { Db } from "@/database/client";
import { enqueueUserEvent, findJointAlertFacts, listAlertInspectors } from "@/database/queries/outbox";
import { publicUrl } from "./public-url";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

/**
 * Alert for an out-of-limits joint: one mail to each active inspector (except the fuser
 * who made it, who may not review it), dedupe key `joint-alert:<jointId>:<inspectorId>`.
 * A joint within limits sends nothing. Call it inside the transaction that records the
 * joint: the mail is queued with the joint, and sending happens later, so a mail server
 * that is down never blocks recording.
 */
export async function enqueueJointAlert({ jointId }: { jointId: number }, trx?: Db): Promise<{ queued: number }> {
  // Out of limits when recorded, or since (a pressure trace found it).
  const joint = await findJointAlertFacts({ jointId }, trx);
  if (!joint || joint.outcome !== "out-of-limits") return { queued: 0 };
  const findings = [...joint.findingMessages.map((message) => ({ message })), ...joint.traceFindingMessages.map((m) => ({ message: `Pressure trace: ${m ?? ""}` }))];
  const label = `${joint.jobCode} joint ${joint.jointNo}`;
  const timeZone = await organisationTimeZone(trx);
  const subject = `Out of limits: ${label} (${findings.length} ${findings.length === 1 ? "finding" : "findings"})`;
  const bodyText = [
    `${label} was recorded out of limits and waits for your review.`,
    "",
    `Job: ${joint.jobCode} ${joint.jobName}`,
    `Made: ${formatInstant(joint.madeAt, "minute", timeZone)} by ${joint.fuserName}`,
    `Pipe: OD ${joint.outsideDiameterMm} mm, SDR ${joint.sdr}${joint.machineTag ? `, machine ${joint.machineTag}` : ""}${joint.station ? `, station ${joint.station}` : ""}`,
    "",
    "Findings:",
    ...findings.map((f) => `- ${f.message ?? "(no message)"}`),
    "",
    `Review it: ${publicUrl()}/review?joint=${joint.id}`,
  ].join("\n");
  let queued = 0;
  for (const inspector of await listAlertInspectors({}, trx)) {
    if (inspector.id === joint.fuserId) continue;
    const result = await enqueueUserEvent({ recipient: inspector, subject, bodyText, kind: "joint-out-of-limits", dedupeKey: `joint-alert:${joint.id}:${inspector.id}` }, trx);
    if (result.queued) queued += 1;
  }
  return { queued };
}
