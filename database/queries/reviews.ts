// Review of recorded joints: the queue (pending joints, oldest first or out of limits first, paged by keyset),
// one joint's evidence (plan, recorded values, photos, pressure trace, revisions), and the
// writes a decision makes — a new joint revision and the joint_states projection — which
// the caller puts in one transaction with the audit entry.
import type { JointConditions } from "@/domain/procedures/weather";
import type { JointFinding } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { FusionPlan } from "@/domain/fusion/plan";
import type { PressureTraceReading } from "@/domain/pressure-trace/read";
import type { ReviewState } from "@/domain/joints/review-states";
import type { RecordedValues } from "@/domain/joints/values";
import type { ChartPoint } from "@/domain/pressure-trace/check";
import type { Knex } from "knex";
import { encodeQueueCursor, type QueueCursor, type QueueQuery } from "@/domain/review/queue";
import { QUEUE_PAGE, type QueueOrder } from "@/domain/review/schemas";
import { conn, type Db } from "../client";
import type { AttachmentRow, JointRow, JointTraceRow } from "../tables";
import { joinJointParts, listJointRevisions as listRevisionsOfJoint, type JointRevision } from "./joints";
import { addJointFindings, jointHasFinding, num, parseJson, text, toRecordedValues } from "./rows";

export type { RevisionKind } from "@/domain/joints/revision-kinds";

export type QueueFilter = QueueQuery;

export type PhotoRef = { id: number; originalName: string | null; contentType: string };

export type TraceSummary = {
  id: number;
  attachmentId: number;
  revisionNo: number;
  sampleCount: number;
  pressureUnit: "mpa" | "psi";
  outcome: JointOutcome;
  findings: JointFinding[];
  reading: PressureTraceReading;
  uploadedAt: Date;
  uploadedByName: string;
};

export type ReviewItem = {
  jointId: number;
  jobId: number;
  jobCode: string;
  jobName: string;
  jointNo: number;
  kind: string;
  fuserId: number;
  fuserName: string;
  machineId: number;
  machineTag: string;
  heaterTag: string;
  /** The standard-based label of the plan ("ASTM F2620 butt fusion"). */
  procedureLabel: string | null;
  /** The procedure row the joint was made under, and its version (what the joint references). */
  procedureCode: string;
  procedureName: string;
  procedureVersionNo: number;
  madeAt: Date;
  station: string | null;
  outsideDiameterMm: number;
  sdr: number;
  /** Outcome in the projection (the trace check can turn it to out of limits). */
  outcome: JointOutcome;
  /** Outcome of the check when the joint was recorded. */
  recordedOutcome: JointOutcome;
  reviewState: ReviewState;
  revisionNo: number;
  findings: JointFinding[];
  plan: FusionPlan | null;
  recorded: RecordedValues;
  /** Ambient and shelter recorded with the joint (the plan's weather rules judge them). */
  conditions: JointConditions;
  photos: PhotoRef[];
  trace: TraceSummary | null;
  replacesJointId: number | null;
  replacedByJointId: number | null;
};

export type RevisionRecord = Omit<JointRevision, "byUserName"> & { byName: string };

/** A row of baseJointQuery: the joint with its state, job, fuser and equipment tags. */
type QueueRow = JointRow & {
  review_state: ReviewState;
  revision_no: number;
  state_outcome: JointOutcome;
  replaced_by_joint_id: number | null;
  job_code: string;
  job_name: string;
  fuser_name: string;
  machine_tag: string;
  heater_tag: string;
  procedure_code: string;
  procedure_name: string;
  procedure_version_no: number;
};

/** A joint_traces row with the uploader's name. */
type TraceRow = Omit<JointTraceRow, "chart" | "finding_parameters" | "joint_id" | "uploaded_by"> & { joint_id?: number; chart?: string; uploaded_by_name: string | null };

function baseJointQuery(k: Db) {
  return joinJointParts(k("joint_states as js").join("joints as j", "j.id", "js.joint_id"))
    .join("procedure_versions as pv", "pv.id", "j.procedure_version_id")
    .join("procedures as p", "p.id", "pv.procedure_id")
    .select(
      "j.*",
      "js.review_state",
      "js.revision_no",
      "js.outcome as state_outcome",
      "js.replaced_by_joint_id",
      "jobs.code as job_code",
      "jobs.name as job_name",
      "f.name as fuser_name",
      "m.asset_tag as machine_tag",
      "h.asset_tag as heater_tag",
      "p.code as procedure_code",
      "p.name as procedure_name",
      "pv.version_no as procedure_version_no",
    );
}

function toItem(r: QueueRow): Omit<ReviewItem, "photos" | "trace"> {
  const plan = parseJson<FusionPlan | null>(r.plan, null);
  return {
    jointId: Number(r.id),
    jobId: Number(r.job_id),
    jobCode: r.job_code,
    jobName: r.job_name,
    jointNo: Number(r.joint_no),
    kind: r.kind,
    fuserId: Number(r.fuser_id),
    fuserName: r.fuser_name,
    machineId: Number(r.machine_id),
    machineTag: r.machine_tag,
    heaterTag: r.heater_tag,
    procedureLabel: plan?.procedureLabel ?? null,
    procedureCode: r.procedure_code,
    procedureName: r.procedure_name,
    procedureVersionNo: Number(r.procedure_version_no),
    madeAt: r.made_at,
    station: text(r.station),
    outsideDiameterMm: Number(r.outside_diameter_mm),
    sdr: Number(r.sdr),
    outcome: r.state_outcome,
    recordedOutcome: r.outcome,
    reviewState: r.review_state,
    revisionNo: Number(r.revision_no),
    findings: parseJson<JointFinding[]>(r.findings, []),
    plan,
    recorded: toRecordedValues(r),
    conditions: { ambientC: num(r.ambient_c), shelter: r.shelter ?? null },
    replacesJointId: num(r.replaces_joint_id),
    replacedByJointId: num(r.replaced_by_joint_id),
  };
}

function toTrace(r: TraceRow): TraceSummary {
  return {
    id: Number(r.id),
    attachmentId: Number(r.attachment_id),
    revisionNo: Number(r.revision_no),
    sampleCount: Number(r.sample_count),
    pressureUnit: r.pressure_unit,
    outcome: r.outcome,
    findings: parseJson<JointFinding[]>(r.findings, []),
    reading: parseJson<PressureTraceReading>(r.reading, null as unknown as PressureTraceReading),
    uploadedAt: r.uploaded_at,
    uploadedByName: r.uploaded_by_name ?? "",
  };
}

async function withEvidence(k: Db, items: Omit<ReviewItem, "photos" | "trace">[]): Promise<ReviewItem[]> {
  if (items.length === 0) return [];
  const ids = items.map((i) => i.jointId);
  const photos = (await k("attachments").whereIn("joint_id", ids).where("kind", "bead-photo").orderBy("id").select("id", "joint_id", "original_name", "content_type")) as Pick<AttachmentRow, "id" | "joint_id" | "original_name" | "content_type">[];
  const latest = k("joint_traces").whereIn("joint_id", ids).groupBy("joint_id").select("joint_id").max({ max_id: "id" });
  const traces = (await k("joint_traces as t")
    .join("users as u", "u.id", "t.uploaded_by")
    .whereIn("t.id", k.from(latest.as("l")).select("max_id"))
    .select("t.id", "t.joint_id", "t.attachment_id", "t.revision_no", "t.sample_count", "t.pressure_unit", "t.outcome", "t.findings", "t.reading", "t.uploaded_at", "u.name as uploaded_by_name")) as TraceRow[];
  const traceBy = new Map(traces.map((t) => [Number(t.joint_id), toTrace(t)]));
  return items.map((item) => ({
    ...item,
    photos: photos.filter((p) => Number(p.joint_id) === item.jointId).map((p) => ({ id: Number(p.id), originalName: p.original_name ?? null, contentType: p.content_type })),
    trace: traceBy.get(item.jointId) ?? null,
  }));
}

function applyFilter<Q extends Knex.QueryBuilder>(q: Q, filter: QueueQuery, skip?: QueueFacet): Q {
  if (filter.jobId && skip !== "job") q.where("j.job_id", filter.jobId);
  if (filter.fuserId && skip !== "fuser") q.where("j.fuser_id", filter.fuserId);
  if (filter.machineId && skip !== "machine") q.where("j.machine_id", filter.machineId);
  if (filter.outcome && skip !== "outcome") q.where("js.outcome", filter.outcome);
  if (filter.madeBefore) q.where("js.made_at", "<", filter.madeBefore);
  if (filter.madeFrom) q.where("js.made_at", ">=", filter.madeFrom);
  if (filter.madeUntil) q.where("js.made_at", "<", filter.madeUntil);
  if (filter.finding && skip !== "finding") {
    const finding = jointHasFinding("j", filter.finding);
    q.whereRaw(finding.sql, finding.bindings);
  }
  return q;
}

/** Pending joints (joint_states joined to joints) with `filter` applied, for counts and id lists. */
function pendingJoints(k: Db, filter: QueueFilter, skip?: QueueFacet) {
  return applyFilter(k("joint_states as js").join("joints as j", "j.id", "js.joint_id").where("js.review_state", "pending-review"), filter, skip);
}

/** After the cursor in (made at, id) order (a range the (…, made_at, joint_id) indexes serve). */
function afterKey(q: Knex.QueryBuilder, cursor: QueueCursor | null) {
  if (cursor) q.where((w) => w.where("js.made_at", ">", cursor.madeAt).orWhere((e) => e.where("js.made_at", cursor.madeAt).where("js.joint_id", ">", cursor.jointId)));
  return q;
}

export type ReviewQueue = { items: ReviewItem[]; total: number; outOfLimits: number; next: string | null };

/**
 * One page of the joints pending review, after `after` (keyset paging: the cursor is the
 * previous page's last sort key, never an offset, so a joint decided meanwhile neither
 * skips nor repeats a row). Order (domain/review/queue.ts compareQueueItems): "oldest" —
 * made at, then id; "out-of-limits-first" — the out-of-limits part, then the within-limits
 * part, each oldest first (one index-ordered read per part). `next` is the cursor of the
 * following page, null on the last. Counts cover the whole filtered queue.
 */
export async function listReviewQueue(
  { filter = {}, order = "oldest", after = null, limit = QUEUE_PAGE }: { filter?: QueueFilter; order?: QueueOrder; after?: QueueCursor | null; limit?: number },
  trx?: Db,
): Promise<ReviewQueue> {
  const k = conn(trx);
  const read = async (outcome: JointOutcome | null, cursor: QueueCursor | null, n: number) => {
    const q = applyFilter(baseJointQuery(k), filter).where("js.review_state", "pending-review");
    if (outcome) q.where("js.outcome", outcome);
    return ((await afterKey(q, cursor).orderBy([{ column: "js.made_at" }, { column: "js.joint_id" }]).limit(n)) as QueueRow[]).map(toItem);
  };
  let rows: Omit<ReviewItem, "photos" | "trace">[];
  if (order === "oldest") rows = await read(null, after, limit + 1);
  else if (after && after.outcome === "within-limits") rows = await read("within-limits", after, limit + 1);
  else {
    rows = await read("out-of-limits", after, limit + 1);
    if (rows.length < limit + 1) rows = [...rows, ...(await read("within-limits", null, limit + 1 - rows.length))];
  }
  const page = rows.slice(0, limit);
  const last = page[page.length - 1];
  const next = rows.length > limit && last ? encodeQueueCursor({ outcome: last.outcome, madeAt: last.madeAt, jointId: last.jointId }) : null;
  const counts = (await pendingJoints(k, filter).select("js.outcome").count({ n: "*" }).groupBy("js.outcome")) as { outcome: JointOutcome; n: number }[];
  const count = (o: JointOutcome) => Number(counts.find((c) => c.outcome === o)?.n ?? 0);
  return { items: await withEvidence(k, page), total: count("out-of-limits") + count("within-limits"), outOfLimits: count("out-of-limits"), next };
}

export type QueueFacet = "job" | "fuser" | "machine" | "outcome" | "finding";

/** How many pending joints each choice of a filter would show, the other filters applied. */
export type QueueFacetCounts = { job: Record<string, number>; fuser: Record<string, number>; machine: Record<string, number>; outcome: Record<string, number>; finding: Record<string, number> };

export async function countQueueFacets({ filter = {} }: { filter?: QueueFilter }, trx?: Db): Promise<QueueFacetCounts> {
  const k = conn(trx);
  // Each facet counted under the filter without its own choice; the five in one round trip (UNION ALL).
  const group = (facet: QueueFacet, column: string, q = pendingJoints(k, filter, facet)) =>
    q.select(k.raw("? AS facet", [facet]), k.ref(column).as("v")).countDistinct({ n: "j.id" }).groupBy(column);
  const parts = [
    group("job", "j.job_id"),
    group("fuser", "j.fuser_id"),
    group("machine", "j.machine_id"),
    group("outcome", "js.outcome"),
    group("finding", "jf.parameter", pendingJoints(k, filter, "finding").join("joint_findings as jf", "jf.joint_id", "j.id")),
  ].map((q) => q.toSQL());
  // Each part in parentheses (knex's own unionAll would move the first part's GROUP BY to the end).
  const [rows] = (await k.raw(
    parts.map((p) => `(${p.sql})`).join(" UNION ALL "),
    parts.flatMap((p) => p.bindings as Knex.Value[]),
  )) as [{ facet: QueueFacet; v: string | number; n: number }[]];
  const counts: QueueFacetCounts = { job: {}, fuser: {}, machine: {}, outcome: {}, finding: {} };
  for (const r of rows) counts[r.facet][String(r.v)] = Number(r.n);
  return counts;
}

export type BatchCandidate = { jointId: number; revisionNo: number; fuserId: number; outcome: JointOutcome };

/**
 * The pending joints within limits that match `filter`, oldest first, at most `limit` (the
 * batch accept's "all matching this filter": the caller asks one more than its bound to
 * know it was passed), and how many matching joints are out of limits (left out).
 */
export async function listBatchCandidates({ filter = {}, limit }: { filter?: QueueFilter; limit: number }, trx?: Db): Promise<{ candidates: BatchCandidate[]; outOfLimits: number }> {
  const k = conn(trx);
  const rows = (await pendingJoints(k, filter)
    .where("js.outcome", "within-limits")
    .orderBy([{ column: "js.made_at" }, { column: "js.joint_id" }])
    .limit(limit)
    .select("js.joint_id", "js.revision_no", "j.fuser_id", "js.outcome")) as { joint_id: number; revision_no: number; fuser_id: number; outcome: JointOutcome }[];
  const out = filter.outcome === "within-limits" ? [] : ((await pendingJoints(k, filter).where("js.outcome", "out-of-limits").count({ n: "*" })) as { n: number }[]);
  return {
    candidates: rows.map((r) => ({ jointId: Number(r.joint_id), revisionNo: Number(r.revision_no), fuserId: Number(r.fuser_id), outcome: r.outcome })),
    outOfLimits: Number(out[0]?.n ?? 0),
  };
}

export async function findReviewItem({ jointId }: { jointId: number }, trx?: Db): Promise<ReviewItem | null> {
  const k = conn(trx);
  const row = (await baseJointQuery(k).where("j.id", jointId).first()) as QueueRow | undefined;
  if (!row) return null;
  return (await withEvidence(k, [toItem(row)]))[0] ?? null;
}

/** The joint's revisions, oldest first (joints.ts reads them; the review names the author `byName`). */
export async function listJointRevisions({ jointId }: { jointId: number }, trx?: Db): Promise<RevisionRecord[]> {
  return (await listRevisionsOfJoint({ jointId }, trx)).map(({ byUserName, ...r }) => ({ ...r, byName: byUserName }));
}

export type JointStateLock = { jointId: number; fuserId: number; reviewState: ReviewState; revisionNo: number; outcome: JointOutcome; jobCode: string; jointNo: number };

/**
 * The joint's current state, locked FOR UPDATE until the caller's transaction ends, so a
 * second decision on the same joint waits and then sees the first one's revision.
 */
export async function lockJointState({ jointId }: { jointId: number }, trx: Db): Promise<JointStateLock | null> {
  // Lock only the projection row (joints and jobs are read without locks: joints is append-only).
  const state = (await trx("joint_states").where("joint_id", jointId).forUpdate().first("joint_id", "review_state", "revision_no", "outcome")) as Pick<QueueRow, "review_state" | "revision_no" | "outcome"> & { joint_id: number } | undefined;
  if (!state) return null;
  const joint = (await trx("joints as j").join("jobs", "jobs.id", "j.job_id").where("j.id", jointId).first("j.fuser_id", "j.joint_no", "jobs.code as job_code")) as Pick<QueueRow, "fuser_id" | "joint_no" | "job_code">;
  return {
    jointId: Number(state.joint_id),
    fuserId: Number(joint.fuser_id),
    reviewState: state.review_state,
    revisionNo: Number(state.revision_no),
    outcome: state.outcome,
    jobCode: joint.job_code,
    jointNo: Number(joint.joint_no),
  };
}

/** The newest revision (who changed the joint last, for conflict messages). */
export async function latestJointRevision({ jointId }: { jointId: number }, trx?: Db): Promise<RevisionRecord | null> {
  const all = await listJointRevisions({ jointId }, trx);
  return all[all.length - 1] ?? null;
}

/**
 * Appends a revision (joints.ts writes it). The unique (joint_id, revision_no) key makes a
 * second writer of the same number fail with a duplicate-key error (the caller answers 409).
 */
export { insertJointRevision } from "./joints";

/** Moves the projection on from `expectedRevisionNo`; false when it had already moved. */
export async function updateJointState(
  s: { jointId: number; expectedRevisionNo: number; revisionNo: number; reviewState: ReviewState; outcome?: JointOutcome; at: Date },
  trx: Db,
): Promise<boolean> {
  const changed = await trx("joint_states")
    .where({ joint_id: s.jointId, revision_no: s.expectedRevisionNo })
    .update({ revision_no: s.revisionNo, review_state: s.reviewState, ...(s.outcome ? { outcome: s.outcome } : {}), updated_at: s.at });
  return changed === 1;
}

export async function insertJointTrace(
  t: { jointId: number; attachmentId: number; revisionNo: number; sampleCount: number; pressureUnit: "mpa" | "psi"; reading: PressureTraceReading; chart: ChartPoint[]; outcome: JointOutcome; findings: JointFinding[]; uploadedBy: number; at: Date },
  trx: Db,
): Promise<number> {
  const [id] = await trx("joint_traces").insert({
    joint_id: t.jointId,
    attachment_id: t.attachmentId,
    revision_no: t.revisionNo,
    sample_count: t.sampleCount,
    pressure_unit: t.pressureUnit,
    reading: JSON.stringify(t.reading),
    chart: JSON.stringify(t.chart),
    outcome: t.outcome,
    findings: JSON.stringify(t.findings),
    finding_parameters: t.findings.length ? [...new Set(t.findings.map((f) => f.parameter))].join(",") : null,
    uploaded_by: t.uploadedBy,
    uploaded_at: t.at,
  });
  await addJointFindings({ jointId: t.jointId, parameters: t.findings.map((f) => f.parameter) }, trx);
  return Number(id);
}

/** The newest trace of a joint with its chart points. */
export async function findLatestJointTrace({ jointId }: { jointId: number }, trx?: Db): Promise<(TraceSummary & { chart: ChartPoint[] }) | null> {
  const row = (await conn(trx)("joint_traces as t").join("users as u", "u.id", "t.uploaded_by").where("t.joint_id", jointId).orderBy("t.id", "desc").first("t.*", "u.name as uploaded_by_name")) as TraceRow | undefined;
  if (!row) return null;
  return { ...toTrace(row), chart: parseJson<ChartPoint[]>(row.chart, []) };
}

export type FilterOption = { id: number; label: string };

/** Jobs, fusers and machines that have joints pending review (the queue's filter lists). */
export async function listQueueFilterOptions(_: Record<string, never> = {}, trx?: Db): Promise<{ jobs: FilterOption[]; fusers: FilterOption[]; machines: FilterOption[] }> {
  const k = conn(trx);
  // The three lists in one round trip: each part names its list and its sort key.
  const [rows] = (await k.raw(
    `SELECT list, id, label FROM (
       SELECT DISTINCT 'job' AS list, jobs.id, CONCAT(jobs.code, ' ', jobs.name) AS label, jobs.code AS sort_key
         FROM joint_states js JOIN joints j ON j.id = js.joint_id JOIN jobs ON jobs.id = j.job_id WHERE js.review_state = 'pending-review'
       UNION ALL SELECT DISTINCT 'fuser', users.id, users.name, users.name
         FROM joint_states js JOIN joints j ON j.id = js.joint_id JOIN users ON users.id = j.fuser_id WHERE js.review_state = 'pending-review'
       UNION ALL SELECT DISTINCT 'machine', m.id, m.asset_tag, m.asset_tag
         FROM joint_states js JOIN joints j ON j.id = js.joint_id JOIN fusion_machines m ON m.id = j.machine_id WHERE js.review_state = 'pending-review'
     ) lists ORDER BY list, sort_key`,
  )) as [{ list: "job" | "fuser" | "machine"; id: number; label: string }[]];
  const options: { jobs: FilterOption[]; fusers: FilterOption[]; machines: FilterOption[] } = { jobs: [], fusers: [], machines: [] };
  const into = { job: options.jobs, fuser: options.fusers, machine: options.machines };
  for (const r of rows) into[r.list].push({ id: Number(r.id), label: r.label });
  return options;
}
