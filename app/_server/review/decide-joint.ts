// Use case: an inspector decides a joint — accepted (with a note) or cut out (the fuser must
// remake it). One transaction: lock the joint's state, check who may decide and that the
// joint has not moved on since the inspector saw it (optimistic locking on revision_no),
// append the revision, move the projection, audit, and queue the fuser's notice on cut-out.
import "server-only";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { enqueueCutOutNotice } from "@/app/_server/mail/cut-out-notice";
import { insertJointRevision, latestJointRevision, lockJointState, updateJointState } from "@/database/queries/reviews";
import type { UserRecord } from "@/database/queries/users";
import { AppError, type ErrorCode } from "@/domain/result";
import type { BatchSkipReason } from "@/domain/review/schemas";
import { REVIEW_STATE_LABELS } from "@/domain/joints/review-states";
import { REVISION_KIND_LABELS } from "@/domain/joints/revision-kinds";
import { acceptNeedsNote, type DecideJointValues } from "@/domain/review/schemas";
import { can, canReview } from "@/domain/roles";
import type { Db } from "@/database/client";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

export type DecisionResult = { jointId: number; revisionNo: number; reviewState: "accepted" | "cut-out"; label: string };

/** A decision refused for a reason the batch accept reports per joint (domain/review/queue BATCH_SKIP_REASONS). */
export class DecisionRefused extends AppError {
  constructor(
    code: ErrorCode,
    message: string,
    readonly reason: BatchSkipReason,
    readonly label: string | null,
  ) {
    super(code, message);
  }
}

async function conflict(jointId: number, trx: Db, label: string, reason: BatchSkipReason = "changed"): Promise<AppError> {
  const latest = await latestJointRevision({ jointId }, trx);
  const who = latest ? ` (${REVISION_KIND_LABELS[latest.kind] ?? latest.kind} by ${latest.byName} at ${formatInstant(latest.at, "minute", await organisationTimeZone(trx))})` : "";
  return new DecisionRefused("conflict", `${label} changed while you were looking at it${who}. Nothing was saved; the queue now shows the joint as it is.`, reason, label);
}

/**
 * `onlyWithinLimits` (the batch accept): a joint out of limits is refused, whatever is sent —
 * each one needs its own look and its own note.
 */
export async function decideJoint(
  input: DecideJointValues,
  { user, requestId, now = new Date(), onlyWithinLimits = false }: { user: UserRecord; requestId: string; now?: Date; onlyWithinLimits?: boolean },
): Promise<DecisionResult> {
  return db().transaction(async (trx) => {
    const state = await lockJointState({ jointId: input.jointId }, trx);
    if (!state) throw new DecisionRefused("not-found", `Joint ${input.jointId} was not found.`, "not-found", null);
    const label = `${state.jobCode} joint ${state.jointNo}`;
    if (!canReview(user, { fuserId: state.fuserId })) {
      if (can(user, "decideJoint")) throw new DecisionRefused("forbidden", `You made ${label} yourself; another inspector must decide it.`, "own-joint", label);
      throw new AppError("forbidden", "Only an inspector may decide a joint.");
    }
    const decided = state.reviewState !== "pending-review";
    if (state.revisionNo !== input.expectedRevisionNo) throw await conflict(state.jointId, trx, label, decided ? "already-decided" : "changed");
    if (decided) {
      throw new DecisionRefused("conflict", `${label} is already ${REVIEW_STATE_LABELS[state.reviewState].toLowerCase()}; it is no longer waiting for a decision.`, "already-decided", label);
    }
    if (onlyWithinLimits && state.outcome !== "within-limits") {
      throw new DecisionRefused("invalid", `${label} is out of limits; open it and decide it on its own.`, "out-of-limits", label);
    }
    if (input.decision === "accepted" && acceptNeedsNote(state.outcome) && input.note.length < 3) {
      const message = "Say why a joint out of limits is accepted (at least 3 characters)";
      throw new AppError("invalid", `Check note: ${message}.`, { note: [message] });
    }
    const revisionNo = state.revisionNo + 1;
    try {
      await insertJointRevision(
        { jointId: state.jointId, revisionNo, kind: input.decision, byUserId: user.id, at: now, reason: input.note || null, reviewState: input.decision, changes: { decision: input.decision, outcome: state.outcome } },
        trx,
      );
    } catch (error) {
      // Another decision took this revision number first (the unique key): one wins.
      if (isDuplicateKey(error)) throw await conflict(state.jointId, trx, label);
      throw error;
    }
    const moved = await updateJointState({ jointId: state.jointId, expectedRevisionNo: state.revisionNo, revisionNo, reviewState: input.decision, at: now }, trx);
    if (!moved) throw await conflict(state.jointId, trx, label);
    await insertAuditEntry(
      {
        actorUserId: user.id,
        action: input.decision === "accepted" ? "joint-accepted" : "joint-cut-out",
        entityType: "joint",
        entityId: state.jointId,
        details: { revisionNo, outcome: state.outcome, note: input.note || null },
        requestId,
      },
      trx,
    );
    if (input.decision === "cut-out") await enqueueCutOutNotice({ jointId: state.jointId, reason: input.note, inspectorName: user.name }, trx);
    return { jointId: state.jointId, revisionNo, reviewState: input.decision, label };
  });
}
