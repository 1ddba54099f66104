// Use case: an inspector accepts many joints within limits with one note. Each joint goes
// through the single decision (decide-joint.ts) in its own transaction — its own revision,
// audit entry and optimistic lock — so one joint that changed or may not be accepted here
// is skipped with its reason and the others are still accepted. Out-of-limits joints and the
// inspector's own joints are refused by the server whatever the screen sent.
import "server-only";
import { listBatchCandidates } from "@/database/queries/reviews";
import type { UserRecord } from "@/database/queries/users";
import { AppError } from "@/domain/result";
import { toQueueQuery } from "@/domain/review/queue";
import { BATCH_SKIP_LABELS, type BatchSkipReason } from "@/domain/review/schemas";
import { MAX_BATCH_ACCEPT, type BatchAcceptValues } from "@/domain/review/schemas";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { decideJoint, DecisionRefused } from "./decide-joint";

export type BatchSkip = { jointId: number; label: string | null; reason: BatchSkipReason; message: string };
export type BatchAcceptResult = {
  accepted: { jointId: number; label: string; revisionNo: number }[];
  skipped: BatchSkip[];
  /** "All matching": joints matching the filter that are out of limits, never part of a batch. */
  outOfLimitsLeftOut: number;
  /** One sentence for the screen's status line. */
  message: string;
};

function summary(accepted: number, skipped: BatchSkip[], leftOut: number): string {
  const parts = [`${accepted} ${accepted === 1 ? "joint" : "joints"} accepted.`];
  if (skipped.length) parts.push(`${skipped.length} skipped: ${skipped.map((s) => `${s.label ?? `joint ${s.jointId}`} (${BATCH_SKIP_LABELS[s.reason]})`).join("; ")}.`);
  if (leftOut) parts.push(`${leftOut} out-of-limits ${leftOut === 1 ? "joint matches" : "joints match"} the filter and ${leftOut === 1 ? "was" : "were"} left for a decision of its own.`);
  return parts.join(" ");
}

export async function acceptBatch(input: BatchAcceptValues, { user, requestId, now = new Date() }: { user: UserRecord; requestId: string; now?: Date }): Promise<BatchAcceptResult> {
  let targets: { jointId: number; expectedRevisionNo: number }[];
  let leftOut = 0;
  if (input.matching) {
    const query = toQueueQuery(input.matching, { now, zone: await organisationTimeZone() });
    const { candidates, outOfLimits } = await listBatchCandidates({ filter: query, limit: MAX_BATCH_ACCEPT + 1 });
    if (candidates.length > MAX_BATCH_ACCEPT) {
      throw new AppError(
        "too-large",
        `More than ${MAX_BATCH_ACCEPT} joints within limits match this filter; at most ${MAX_BATCH_ACCEPT} can be accepted at once. Narrow the filter (job, fuser, machine or dates) and accept again. Nothing was accepted.`,
      );
    }
    targets = candidates.map((c) => ({ jointId: c.jointId, expectedRevisionNo: c.revisionNo }));
    leftOut = outOfLimits;
  } else {
    const seen = new Set<number>();
    targets = (input.joints ?? []).filter((j) => (seen.has(j.jointId) ? false : (seen.add(j.jointId), true)));
  }
  const accepted: BatchAcceptResult["accepted"] = [];
  const skipped: BatchSkip[] = [];
  for (const t of targets) {
    try {
      const r = await decideJoint({ jointId: t.jointId, decision: "accepted", note: input.note, expectedRevisionNo: t.expectedRevisionNo }, { user, requestId, now, onlyWithinLimits: true });
      accepted.push({ jointId: r.jointId, label: r.label, revisionNo: r.revisionNo });
    } catch (error) {
      if (!(error instanceof DecisionRefused)) throw error;
      skipped.push({ jointId: t.jointId, label: error.label, reason: error.reason, message: error.message });
    }
  }
  return { accepted, skipped, outOfLimitsLeftOut: leftOut, message: summary(accepted.length, skipped, leftOut) };
}
