// Input schemas of the review screen: a decision on a joint, the queue's filter and a
// pressure-trace upload. Used by the forms (zodResolver) and parsed again on the server.
import { z } from "zod";
import { JOINT_PARAMETERS, type JointParameter } from "@/domain/fusion/parameters";
import type { JointOutcome } from "@/domain/joints/outcomes";
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

/** Queue filter from the query string; empty values mean "any". */
export const reviewQueueFilterSchema = z.object({
  job: optionalId("Job"),
  fuser: optionalId("Fuser"),
  machine: optionalId("Machine"),
  finding: z.preprocess(
    (v) => (v === "" || v === null ? undefined : v),
    z.enum(JOINT_PARAMETERS as unknown as [JointParameter, ...JointParameter[]], { error: "Finding must be chosen from the list" }).optional(),
  ),
  limit: z.preprocess(
    toNumberInput,
    z.number({ error: "Limit must be a number" }).int({ error: "Limit must be a whole number" }).min(1, { error: "Limit must be 1 or more" }).max(200, { error: "Limit must be at most 200" }).default(50),
  ),
});
export type ReviewQueueFilter = z.output<typeof reviewQueueFilterSchema>;

/** Largest pressure-trace file accepted, bytes (a 1 Hz log of an hour is under 100 kB). */
export const MAX_TRACE_FILE_BYTES = 2_000_000;

export const attachTraceSchema = z.object({ jointId: id("Joint", "bigint") });

/** Admin: put a failed outbox mail back in the queue. */
export const retryMailSchema = z.object({ id: id("Mail", "bigint") });

/** Anyone signed in: one mail per alert, or one summary a day. */
export const mailPreferenceSchema = z.object({
  dailyDigest: z.preprocess((v) => (v === "true" ? true : v === "false" ? false : v), z.boolean({ error: "Choose each alert or a daily summary" })),
});
