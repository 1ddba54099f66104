// Input schemas of the review screen: a decision on a joint, the queue's filter and a
// pressure-trace upload. Used by the forms (zodResolver) and parsed again on the server.
import { z } from "zod";
import { JOINT_PARAMETERS, type JointParameter } from "@/domain/fusion/parameters";
import type { JointOutcome } from "@/domain/joints/outcomes";
import { isIsoDate } from "@/domain/dates/civil";
import { ID_MAX, optionalId as optionalIdOf, requiredId, toNumberInput, type IdColumn } from "@/domain/form-fields";

export const REVIEW_DECISIONS = ["accepted", "cut-out"] as const;
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];

/** Longest decision note kept, characters. */
export const MAX_NOTE_LENGTH = 2000;

const id = (label: string, column: IdColumn) => requiredId(`${label} must be chosen from the list`, column, `${label} must be chosen from the list (a whole number id)`);

/**
 * A decision: accepted (with a note) or cut out (with the reason). `expectedRevisionNo` is
 * the revision the inspector saw; the decision fails with a conflict when the joint has
 * moved on since (optimistic locking). A cut-out always needs a reason; accepting a joint
 * that is out of limits needs a note too (checked where the outcome is known).
 */
export const decideJointSchema = z
  .object({
    jointId: id("Joint", "bigint"),
    decision: z.enum(REVIEW_DECISIONS, { error: "Decision must be accepted or cut out" }),
    note: z
      .string({ error: "Note must be text" })
      .trim()
      .max(MAX_NOTE_LENGTH, { error: `Note must be at most ${MAX_NOTE_LENGTH} characters` })
      .default(""),
    expectedRevisionNo: z.coerce
      .number({ error: "Revision must be a number" })
      .int({ error: "Revision must be a whole number" })
      .min(1, { error: "Revision must be 1 or more" })
      .max(ID_MAX.int, { error: "Revision is not one of this joint's" }),
  })
  .superRefine((value, ctx) => {
    if (value.decision === "cut-out" && value.note.length < 3) {
      ctx.addIssue({ code: "custom", path: ["note"], message: "Say why the joint is cut out (at least 3 characters)" });
    }
  });
export type DecideJointInput = z.input<typeof decideJointSchema>;
export type DecideJointValues = z.output<typeof decideJointSchema>;

/** Note needed to accept a joint with this outcome? (an out-of-limits joint needs the reason it is kept). */
export function acceptNeedsNote(outcome: JointOutcome): boolean {
  return outcome === "out-of-limits";
}

const optionalId = (label: string) => optionalIdOf(`${label} must be chosen from the list`);

const optionalText = (v: unknown) => (v === "" || v === null ? undefined : v);

/** Queue orders: the oldest first (the default), or out of limits first, then the oldest. */
export const QUEUE_ORDERS = ["oldest", "out-of-limits-first"] as const;
export type QueueOrder = (typeof QUEUE_ORDERS)[number];

/** Largest page of the queue the API serves, and the page the screen asks for. */
export const MAX_QUEUE_PAGE = 200;
export const QUEUE_PAGE = 50;

const civilDate = (label: string) =>
  z.preprocess(optionalText, z.string({ error: `${label} must be a date` }).refine(isIsoDate, { error: `${label} must be a date (YYYY-MM-DD)` }).optional());

/**
 * The queue's filter, as the URL and the API carry it; empty values mean "any". `waiting`
 * keeps joints made more than that many days ago; `from`/`to` are the days the joint was
 * made (the organisation's days, both included).
 */
export const queueFilterFields = {
  job: optionalId("Job"),
  fuser: optionalId("Fuser"),
  machine: optionalId("Machine"),
  outcome: z.preprocess(optionalText, z.enum(["out-of-limits", "within-limits"], { error: "Outcome must be out of limits or within limits" }).optional()),
  finding: z.preprocess(
    optionalText,
    z.enum(JOINT_PARAMETERS as unknown as [JointParameter, ...JointParameter[]], { error: "Finding must be chosen from the list" }).optional(),
  ),
  waiting: z.preprocess(
    toNumberInput,
    z.number({ error: "Waiting more than must be a number of days" }).int({ error: "Waiting more than must be a whole number of days" }).min(1, { error: "Waiting more than must be 1 day or more" }).max(3650, { error: "Waiting more than must be at most 3650 days" }).optional(),
  ),
  from: civilDate("Made from"),
  to: civilDate("Made to"),
};

export const queueFilterSchema = z.object(queueFilterFields).superRefine((v, ctx) => {
  if (v.from && v.to && v.from > v.to) ctx.addIssue({ code: "custom", path: ["to"], message: "Made to must be on or after Made from" });
});
export type QueueFilterValues = z.output<typeof queueFilterSchema>;

/** Queue page from the query string: the filter, the order, the cursor after which to read, the page size. */
export const reviewQueueFilterSchema = z
  .object({
    ...queueFilterFields,
    order: z.preprocess(optionalText, z.enum(QUEUE_ORDERS, { error: "Order must be oldest first or out of limits first" }).default("oldest")),
    after: z.preprocess(optionalText, z.string({ error: "Cursor must be text" }).max(200, { error: "Cursor is not valid" }).optional()),
    limit: z.preprocess(
      toNumberInput,
      z.number({ error: "Limit must be a number" }).int({ error: "Limit must be a whole number" }).min(1, { error: "Limit must be 1 or more" }).max(MAX_QUEUE_PAGE, { error: `Limit must be at most ${MAX_QUEUE_PAGE}` }).default(QUEUE_PAGE),
    ),
  })
  .superRefine((v, ctx) => {
    if (v.from && v.to && v.from > v.to) ctx.addIssue({ code: "custom", path: ["to"], message: "Made to must be on or after Made from" });
  });
export type ReviewQueueFilter = z.output<typeof reviewQueueFilterSchema>;

/** Most joints one batch accepts (each is its own transaction; a larger batch is refused whole). */
export const MAX_BATCH_ACCEPT = 100;

/**
 * Batch accept of joints within limits, one note for all: either the rows the inspector
 * ticked, each with the revision seen (optimistic locking), or every joint matching a queue
 * filter, resolved on the server. The server keeps out of limits and the inspector's own
 * joints out whatever is sent.
 */
export const batchAcceptSchema = z
  .object({
    note: z.string({ error: "Note must be text" }).trim().max(MAX_NOTE_LENGTH, { error: `Note must be at most ${MAX_NOTE_LENGTH} characters` }).default(""),
    joints: z
      .array(z.object({ jointId: id("Joint", "bigint"), expectedRevisionNo: z.preprocess(toNumberInput, z.number({ error: "Revision must be a number" }).int({ error: "Revision must be a whole number" }).min(1, { error: "Revision must be 1 or more" })) }), { error: "Joints must be a list" })
      .max(MAX_BATCH_ACCEPT, { error: `At most ${MAX_BATCH_ACCEPT} joints can be accepted at once; select fewer` })
      .optional(),
    matching: queueFilterSchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (!v.joints && !v.matching) ctx.addIssue({ code: "custom", path: ["joints"], message: "Select the joints to accept" });
    if (v.joints && v.matching) ctx.addIssue({ code: "custom", path: ["joints"], message: "Send either the selected joints or a filter, not both" });
    if (v.joints && v.joints.length === 0) ctx.addIssue({ code: "custom", path: ["joints"], message: "Select the joints to accept" });
  });
export type BatchAcceptInput = z.input<typeof batchAcceptSchema>;
export type BatchAcceptValues = z.output<typeof batchAcceptSchema>;

/** Why a joint was left out of a batch accept. */
export const BATCH_SKIP_REASONS = ["out-of-limits", "own-joint", "already-decided", "changed", "not-found"] as const;
export type BatchSkipReason = (typeof BATCH_SKIP_REASONS)[number];

export const BATCH_SKIP_LABELS: Record<BatchSkipReason, string> = {
  "out-of-limits": "out of limits: open it and decide it on its own",
  "own-joint": "your own joint: another inspector must decide it",
  "already-decided": "already decided",
  changed: "changed since you loaded the queue",
  "not-found": "no such joint",
};

/** Largest pressure-trace file accepted, bytes (a 1 Hz log of an hour is under 100 kB). */
export const MAX_TRACE_FILE_BYTES = 2_000_000;

export const attachTraceSchema = z.object({ jointId: id("Joint", "bigint") });

/** Admin: put a failed outbox mail back in the queue. */
export const retryMailSchema = z.object({ id: id("Mail", "bigint") });
