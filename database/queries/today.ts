// The Today page's counts per role: review queue, coils waiting for labels, exports still
// running. (Qualification, heater and machine lists come from their own query modules.)
import type { JointOutcome } from "@/domain/joints/outcomes";
import { conn, type Db } from "../client";
import type { CoilTableRow, ExportRow } from "../tables";

export type ReviewQueueSummary = {
  count: number;
  oldest: { jointId: number; jobCode: string; jointNo: number; madeAt: Date; outcome: JointOutcome } | null;
};

/** Joints waiting for an inspector's decision, and the one waiting longest (by when it was made). */
export async function reviewQueueSummary(_: Record<string, never> = {}, trx?: Db): Promise<ReviewQueueSummary> {
  // One round trip: the oldest row carries the count of all (a window over the whole result, taken before the limit).
  const oldest = (await conn(trx)("joint_states")
    .join("joints", "joints.id", "joint_states.joint_id")
    .join("jobs", "jobs.id", "joints.job_id")
    .where("joint_states.review_state", "pending-review")
    .orderBy([{ column: "joint_states.made_at", order: "asc" }, { column: "joint_states.joint_id", order: "asc" }])
    .select("joint_states.joint_id", "joint_states.made_at", "joint_states.outcome", "joints.joint_no", "jobs.code as job_code", conn(trx).raw("COUNT(*) OVER () AS n"))
    .first()) as { joint_id: number; made_at: Date; outcome: JointOutcome; joint_no: number; job_code: string; n: number } | undefined;
  return {
    count: Number(oldest?.n ?? 0),
    oldest: oldest ? { jointId: Number(oldest.joint_id), jobCode: oldest.job_code, jointNo: oldest.joint_no, madeAt: oldest.made_at, outcome: oldest.outcome } : null,
  };
}

export type UnlabelledCoil = { id: number; coilCode: string; lot: string; nominalSize: string; receivedAt: Date };

/** Coils received whose label has not been printed yet, oldest receipt first. */
export async function listCoilsAwaitingLabel({ limit = 10 }: { limit?: number } = {}, trx?: Db): Promise<{ count: number; coils: UnlabelledCoil[] }> {
  const k = conn(trx);
  // The count of all rides on each row (COUNT(*) OVER () is taken before the limit); no row, no coil.
  const rows = await k("coils").whereNull("label_printed_at").orderBy([{ column: "received_at" }, { column: "id" }]).limit(limit).select("id", "coil_code", "lot", "nominal_size", "received_at", k.raw("COUNT(*) OVER () AS n"));
  return {
    count: Number(rows[0]?.n ?? 0),
    coils: rows.map((r: Pick<CoilTableRow, "id" | "coil_code" | "lot" | "nominal_size" | "received_at">) => ({ id: r.id, coilCode: r.coil_code, lot: r.lot, nominalSize: r.nominal_size, receivedAt: r.received_at })),
  };
}

export type RunningExport = { id: number; userId: number; userName: string; format: "xlsx" | "csv"; startedAt: Date };

/** Exports still running (optionally only one person's), oldest first. */
export async function listRunningExports({ userId, limit = 10 }: { userId?: number; limit?: number } = {}, trx?: Db): Promise<{ count: number; exports: RunningExport[] }> {
  const k = conn(trx);
  const base = () => {
    const q = k("exports").where("exports.status", "running");
    if (userId) q.where("exports.user_id", userId);
    return q;
  };
  // As above: the count of all on each row, one round trip.
  const rows = await base().join("users", "users.id", "exports.user_id").orderBy("exports.started_at").limit(limit).select("exports.id", "exports.user_id", "exports.format", "exports.started_at", "users.name as user_name", k.raw("COUNT(*) OVER () AS n"));
  return {
    count: Number(rows[0]?.n ?? 0),
    exports: rows.map((r: Pick<ExportRow, "id" | "user_id" | "format" | "started_at"> & { user_name: string }) => ({ id: Number(r.id), userId: r.user_id, userName: r.user_name, format: r.format, startedAt: r.started_at })),
  };
}
