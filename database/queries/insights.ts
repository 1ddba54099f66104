// The numbers behind the Insights charts, straight from the joint records.
// First-pass yield: the share of joints made in the period that are within limits (by the
// check at recording, or since by their pressure trace) and were not cut out — our own
// definition of "right first time" for a fusion joint (common practice, no published
// source). Weeks start on Monday (ISO 8601), at local midnight in the organisation's time zone.
import type { JointParameter } from "@/domain/fusion/parameters";
import { localWeeks, UTC_ZONE } from "@/domain/dates/zone";
import { conn, type Db } from "../client";

export type InsightsFilter = { from: Date; to: Date; jobId?: number; procedureId?: number };

export type YieldRow = { joints: number; firstPass: number; yieldPct: number };
export type WeekYield = YieldRow & { weekStart: string };
export type GroupYield = YieldRow & { id: number; label: string };

const pct = (firstPass: number, joints: number) => (joints === 0 ? 0 : Math.round((firstPass / joints) * 1000) / 10);

function base(k: Db, f: InsightsFilter) {
  const q = k("joints as j").join("joint_states as js", "js.joint_id", "j.id").where("j.made_at", ">=", f.from).where("j.made_at", "<", f.to);
  if (f.jobId) q.where("j.job_id", f.jobId);
  if (f.procedureId) q.join("procedure_versions as pv", "pv.id", "j.procedure_version_id").where("pv.procedure_id", f.procedureId);
  return q;
}

const FIRST_PASS = "SUM(CASE WHEN js.outcome = 'within-limits' AND js.review_state <> 'cut-out' THEN 1 ELSE 0 END)";

function toYield(r: { joints: number | string; first_pass: number | string | null }): YieldRow {
  const joints = Number(r.joints);
  const firstPass = Number(r.first_pass ?? 0);
  return { joints, firstPass, yieldPct: pct(firstPass, joints) };
}

/**
 * First-pass yield per local week (Monday, in `timeZone`) in the period, oldest week first.
 * The week boundaries are local midnights worked out in domain/dates (23- or 25-hour days
 * included) and bound as instants, so the database needs no time-zone tables.
 */
export async function firstPassYieldByWeek(filter: InsightsFilter & { timeZone?: string }, trx?: Db): Promise<WeekYield[]> {
  const k = conn(trx);
  const weeks = localWeeks(filter.from, filter.to, filter.timeZone ?? UTC_ZONE);
  if (weeks.length === 0) return [];
  // The last week whose start is at or before made_at: test the later starts first.
  const arms = [...weeks].reverse().map(() => "WHEN j.made_at >= ? THEN ?").join(" ");
  const bindings = [...weeks].reverse().flatMap((w) => [w.start, w.weekStart]);
  const inner = base(k, filter).select(k.raw(`CASE ${arms} END AS week_start`, bindings), "js.outcome", "js.review_state");
  const rows = (await k
    .from(inner.as("t"))
    .select("t.week_start", k.raw("COUNT(*) AS joints"), k.raw("SUM(CASE WHEN t.outcome = 'within-limits' AND t.review_state <> 'cut-out' THEN 1 ELSE 0 END) AS first_pass"))
    .whereNotNull("t.week_start")
    .groupBy("t.week_start")
    .orderBy("t.week_start")) as { week_start: string; joints: number; first_pass: number }[];
  return rows.map((r) => ({ weekStart: r.week_start, ...toYield(r) }));
}

/** First-pass yield per fuser, most joints first. */
export async function firstPassYieldByFuser(filter: InsightsFilter, trx?: Db): Promise<GroupYield[]> {
  const k = conn(trx);
  const rows = (await base(k, filter)
    .join("users as u", "u.id", "j.fuser_id")
    .select("u.id", "u.name as label", k.raw("COUNT(*) AS joints"), k.raw(`${FIRST_PASS} AS first_pass`))
    .groupBy("u.id", "u.name")
    .orderBy([{ column: "joints", order: "desc" }, { column: "u.name" }])) as { id: number; label: string; joints: number; first_pass: number }[];
  return rows.map((r) => ({ id: Number(r.id), label: r.label, ...toYield(r) }));
}

/** First-pass yield per fusion machine, most joints first. */
export async function firstPassYieldByMachine(filter: InsightsFilter, trx?: Db): Promise<GroupYield[]> {
  const k = conn(trx);
  const rows = (await base(k, filter)
    .join("fusion_machines as m", "m.id", "j.machine_id")
    .select("m.id", "m.asset_tag as label", k.raw("COUNT(*) AS joints"), k.raw(`${FIRST_PASS} AS first_pass`))
    .groupBy("m.id", "m.asset_tag")
    .orderBy([{ column: "joints", order: "desc" }, { column: "m.asset_tag" }])) as { id: number; label: string; joints: number; first_pass: number }[];
  return rows.map((r) => ({ id: Number(r.id), label: r.label, ...toYield(r) }));
}

export type ParameterCount = { parameter: JointParameter; joints: number };

/**
 * How many joints had a finding on each parameter at recording (a joint with two findings
 * on one parameter counts once), most first. Read from the findings JSON with JSON_TABLE.
 */
export async function findingsByParameter(filter: InsightsFilter, trx?: Db): Promise<ParameterCount[]> {
  const k = conn(trx);
  const rows = (await base(k, filter)
    .joinRaw("CROSS JOIN JSON_TABLE(j.findings, '$[*]' COLUMNS (parameter VARCHAR(40) PATH '$.parameter')) AS f")
    .select("f.parameter", k.raw("COUNT(DISTINCT j.id) AS joints"))
    .groupBy("f.parameter")
    .orderBy([{ column: "joints", order: "desc" }, { column: "f.parameter" }])) as { parameter: JointParameter; joints: number }[];
  return rows.map((r) => ({ parameter: r.parameter, joints: Number(r.joints) }));
}

export type HeaterPoint = { jointId: number; madeAt: Date; heaterTemperatureC: number; minC: number | null; maxC: number | null; heaterTag: string };

/** Recorded heater temperatures with the procedure's window from each joint's plan, oldest first (at most `limit`, the newest kept). */
export async function heaterTemperatures({ limit = 2000, ...filter }: InsightsFilter & { limit?: number }, trx?: Db): Promise<HeaterPoint[]> {
  const k = conn(trx);
  const rows = (await base(k, filter)
    .join("heater_plates as h", "h.id", "j.heater_id")
    .whereNotNull("j.heater_temperature_c")
    .select(
      "j.id",
      "j.made_at",
      "j.heater_temperature_c",
      "h.asset_tag",
      k.raw("CAST(JSON_VALUE(j.plan, '$.heaterTemperatureC.min') AS DOUBLE) AS min_c"),
      k.raw("CAST(JSON_VALUE(j.plan, '$.heaterTemperatureC.max') AS DOUBLE) AS max_c"),
    )
    .orderBy([{ column: "j.made_at", order: "desc" }, { column: "j.id", order: "desc" }])
    .limit(limit)) as { id: number; made_at: Date; heater_temperature_c: number; asset_tag: string; min_c: number | null; max_c: number | null }[];
  return rows
    .map((r) => ({ jointId: Number(r.id), madeAt: r.made_at, heaterTemperatureC: Number(r.heater_temperature_c), minC: r.min_c === null ? null : Number(r.min_c), maxC: r.max_c === null ? null : Number(r.max_c), heaterTag: r.asset_tag }))
    .reverse();
}

export type CoolingPoint = { jointId: number; label: string; madeAt: Date; coolingS: number; minCoolingS: number };

/** Cooling time recorded against the plan's minimum, for joints with both, oldest first (at most `limit`, the newest kept). */
export async function coolingRecordedVersusRequired({ limit = 2000, ...filter }: InsightsFilter & { limit?: number }, trx?: Db): Promise<CoolingPoint[]> {
  const k = conn(trx);
  const required = "CAST(JSON_VALUE(j.plan, '$.minCoolingS') AS DOUBLE)";
  const rows = (await base(k, filter)
    .join("jobs", "jobs.id", "j.job_id")
    .whereNotNull("j.cooling_s")
    .whereRaw(`${required} IS NOT NULL`)
    .select("j.id", "j.joint_no", "j.made_at", "j.cooling_s", "jobs.code", k.raw(`${required} AS min_cooling_s`))
    .orderBy([{ column: "j.made_at", order: "desc" }, { column: "j.id", order: "desc" }])
    .limit(limit)) as { id: number; joint_no: number; made_at: Date; cooling_s: number; code: string; min_cooling_s: number }[];
  return rows.map((r) => ({ jointId: Number(r.id), label: `${r.code} joint ${r.joint_no}`, madeAt: r.made_at, coolingS: Number(r.cooling_s), minCoolingS: Number(r.min_cooling_s) })).reverse();
}

export type InsightsSummary = YieldRow & { outOfLimits: number; cutOut: number; pending: number };

export async function insightsSummary(filter: InsightsFilter, trx?: Db): Promise<InsightsSummary> {
  const k = conn(trx);
  const row = (await base(k, filter)
    .select(
      k.raw("COUNT(*) AS joints"),
      k.raw(`${FIRST_PASS} AS first_pass`),
      k.raw("SUM(CASE WHEN js.outcome = 'out-of-limits' THEN 1 ELSE 0 END) AS out_of_limits"),
      k.raw("SUM(CASE WHEN js.review_state = 'cut-out' THEN 1 ELSE 0 END) AS cut_out"),
      k.raw("SUM(CASE WHEN js.review_state = 'pending-review' THEN 1 ELSE 0 END) AS pending"),
    )
    .first()) as { joints: number; first_pass: number | null; out_of_limits: number | null; cut_out: number | null; pending: number | null };
  return { ...toYield(row), outOfLimits: Number(row.out_of_limits ?? 0), cutOut: Number(row.cut_out ?? 0), pending: Number(row.pending ?? 0) };
}
