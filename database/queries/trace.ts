// Trace, both directions. Lot → ground: the coils of a lot and every joint made with them
// on either side (coil_a_id or coil_b_id) — two indexed lookups joined by UNION, never an
// OR across the two columns, so it stays fast on millions of joints. Joint → origins: the
// two components with their lots and receipt inspections, machine, heater plate and its
// last check before the joint, the fuser's qualification records, the procedure version.
import { lotMatch, readScannedCoilText, type LotMatch } from "@/domain/coils/life";
import { traceCodeLotField } from "@/domain/trace-code/trace-code";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { JointKind } from "@/domain/joints/schemas";
import type { JointReference } from "@/domain/joints/reference";
import type { ReviewState } from "@/domain/joints/review-states";
import { conn, type Db } from "../client";
import { coilQuery, findCoilByCode, listCoilsByTraceCode, toCoil, type Coil } from "./coils";
import type { FusionMachineRow, HeaterCheckRow, HeaterPlateRow, JointRevisionRow, JointRow } from "../tables";
import { day, isoDay, num, text } from "./rows";

export type LotKey = { manufacturer: string; lot: string };

export type LotSearchResult = {
  /** How the search was read. */
  matchedBy: "lot" | "coil-id" | "trace-code" | "none";
  lots: LotKey[];
  /** Each coil with how it answered a search by lot (typed lot, the lot in its code, both); null for other searches. */
  coils: (Coil & { foundBy: LotMatch | null })[];
};

/** Every coil of the given lots (manufacturer + lot), by coil id. */
export async function listCoilsOfLots({ lots }: { lots: LotKey[] }, trx?: Db): Promise<Coil[]> {
  if (!lots.length) return [];
  const q = coilQuery(trx).where((w) => {
    for (const key of lots) w.orWhere((x) => x.where("coils.manufacturer", key.manufacturer).where("coils.lot", key.lot));
  });
  const rows = (await q.orderBy("coils.coil_code")) as Parameters<typeof toCoil>[0][];
  return rows.map(toCoil);
}

/**
 * Reads a trace search and finds the lot(s) and all their coils. `code` may be our coil id,
 * an F2897 code, or a label URL: a coil id → that coil's lot; an F2897 code → the lots of the
 * coils that carry it. `lot` (with or without `manufacturer`) → coils of that lot.
 */
export async function findLotCoils({ manufacturer, lot, code }: { manufacturer?: string; lot?: string; code?: string }, trx?: Db): Promise<LotSearchResult> {
  let lots: LotKey[] = [];
  let matchedBy: LotSearchResult["matchedBy"] = "none";
  if (code && code.trim()) {
    const scanned = readScannedCoilText(code);
    if (scanned.kind !== "empty") {
      const coil = await findCoilByCode({ coilCode: scanned.code }, trx);
      if (coil) {
        lots = [{ manufacturer: coil.manufacturer, lot: coil.lot }];
        matchedBy = "coil-id";
      } else if (scanned.kind === "trace-code") {
        const coils = await listCoilsByTraceCode({ traceCode: scanned.code }, trx);
        lots = uniqueLots(coils.map((c) => ({ manufacturer: c.manufacturer, lot: c.lot })));
        matchedBy = lots.length ? "trace-code" : "none";
      }
    }
  } else if (lot && lot.trim()) {
    // A recall names the lot the pipe maker printed: find a coil by its typed lot or by the
    // lot its F2897 code carries (they differ when a coil was saved with a reason), and say which.
    const wanted = lot.trim();
    const codeLot = traceCodeLotField(wanted);
    const q = coilQuery(trx).where((w) => {
      w.where("coils.lot", wanted);
      if (codeLot) w.orWhere("coils.trace_code_lot", codeLot);
    });
    if (manufacturer && manufacturer.trim()) q.where("coils.manufacturer", manufacturer.trim());
    const coils = ((await q.orderBy("coils.coil_code")) as Parameters<typeof toCoil>[0][]).map(toCoil).map((c) => ({ ...c, foundBy: lotMatch(c, wanted) }));
    const found = coils.filter((c) => c.foundBy !== null);
    lots = uniqueLots(found.map((c) => ({ manufacturer: c.manufacturer, lot: wanted })));
    return { matchedBy: found.length ? "lot" : "none", lots, coils: found };
  }
  const coils = await listCoilsOfLots({ lots }, trx);
  return { matchedBy, lots, coils: coils.map((c) => ({ ...c, foundBy: null })) };
}

function uniqueLots(keys: LotKey[]): LotKey[] {
  const seen = new Map<string, LotKey>();
  for (const key of keys) seen.set(`${key.manufacturer}\u0000${key.lot}`, key);
  return [...seen.values()];
}

/** Another joint named by id, job code and joint number (a remake and the joint it replaced). */
export type JointLink = { id: number; jobCode: string; jointNo: number };

export type TracedJoint = {
  id: number;
  jobId: number;
  jobCode: string;
  jobName: string;
  jointNo: number;
  kind: JointKind;
  madeAt: Date;
  station: string | null;
  latitude: number | null;
  longitude: number | null;
  fuserId: number;
  fuserName: string;
  outcome: JointOutcome;
  /** Review state (a joint without a state row yet counts as pending review). */
  reviewState: ReviewState;
  /** The remake that replaced this cut-out joint (same job), or null. */
  replacedBy: JointLink | null;
  /** The cut-out joint this one remakes, or null. */
  replaces: JointLink | null;
  coilAId: number | null;
  coilACode: string | null;
  coilALot: string | null;
  coilBId: number | null;
  coilBCode: string | null;
  coilBLot: string | null;
  componentBText: string | null;
  lengthAM: number | null;
  lengthBM: number | null;
  /** Which side(s) of the joint came from the traced coils. */
  side: "a" | "b" | "both";
};

export const TRACE_JOINT_LIMIT = 50_000;

/**
 * The joint facts both directions show: the joint with its job, review state and the
 * joints it replaced or was replaced by (JOINT_FACTS_SELECT over JOINT_FACTS_JOINS).
 */
type JointFactsRow = Pick<JointRow, "id" | "job_id" | "joint_no" | "kind" | "made_at" | "station" | "latitude" | "longitude" | "outcome" | "component_b_text" | "length_a_m" | "length_b_m" | "replaces_joint_id"> & {
  job_code: string;
  job_name: string;
  review_state: ReviewState;
  replaced_by_joint_id: number | null;
  replaced_by_joint_no: number | null;
  replaced_by_job_code: string | null;
  replaces_joint_no: number | null;
  replaces_job_code: string | null;
};

/** Columns of JointFactsRow besides j.* (aliases: j joints, jb jobs, s joint_states, nj/njb the remake, rj/rjb the replaced joint). */
const JOINT_FACTS_SELECT = `jb.code AS job_code, jb.name AS job_name, COALESCE(s.review_state, 'pending-review') AS review_state,
            s.replaced_by_joint_id, nj.joint_no AS replaced_by_joint_no, njb.code AS replaced_by_job_code,
            rj.joint_no AS replaces_joint_no, rjb.code AS replaces_job_code`;

/** Each a primary-key lookup per joint, so a lot of 200 joints stays a few hundred index reads. */
const JOINT_FACTS_JOINS = `JOIN jobs jb ON jb.id = j.job_id
       LEFT JOIN joint_states s ON s.joint_id = j.id
       LEFT JOIN joints nj ON nj.id = s.replaced_by_joint_id
       LEFT JOIN jobs njb ON njb.id = nj.job_id
       LEFT JOIN joints rj ON rj.id = j.replaces_joint_id
       LEFT JOIN jobs rjb ON rjb.id = rj.job_id`;

/** A row of listJointsForCoils' SELECT (joint facts with fuser and coils). */
type TracedJointRow = JointFactsRow &
  Pick<JointRow, "fuser_id" | "coil_a_id" | "coil_b_id"> & {
    fuser_name: string;
    coil_a_code: string | null;
    coil_a_lot: string | null;
    coil_b_code: string | null;
    coil_b_lot: string | null;
  };

/** findJointOrigins' joint row: the whole joint with its facts. */
type OriginJointRow = JointRow & JointFactsRow;

/** The heater check row with the name of who made it. */
type CheckRow = HeaterCheckRow & { checked_by_name: string | null };

/** The procedure version row with its procedure's code, name and standard. */
type VersionRow = { id: number; procedure_id: number; version_no: number; published_at: Date; superseded_at: Date | null; code: string; name: string; standard: string };

const link = (id: number | null, jobCode: string | null, jointNo: number | null): JointLink | null =>
  id == null || jobCode == null || jointNo == null ? null : { id: Number(id), jobCode, jointNo: Number(jointNo) };

/** The joint facts the lot trace and a joint's origins both show. */
function jointFacts(r: JointFactsRow) {
  return {
    id: Number(r.id),
    jobId: Number(r.job_id),
    jobCode: r.job_code,
    jobName: r.job_name,
    jointNo: Number(r.joint_no),
    kind: r.kind,
    madeAt: r.made_at,
    station: text(r.station),
    latitude: num(r.latitude),
    longitude: num(r.longitude),
    outcome: r.outcome,
    reviewState: r.review_state,
    replacedBy: link(r.replaced_by_joint_id, r.replaced_by_job_code, r.replaced_by_joint_no),
    replaces: link(r.replaces_joint_id, r.replaces_job_code, r.replaces_joint_no),
    componentBText: text(r.component_b_text),
    lengthAM: num(r.length_a_m),
    lengthBM: num(r.length_b_m),
  };
}

/**
 * Every joint made with any of the coils, on either side, ordered by job, time, id. The
 * ids come from `coil_a_id IN (…) UNION coil_b_id IN (…)` — each arm uses its own index.
 * At most `limit` joints (default 50,000); `truncated` says when more exist.
 */
export async function listJointsForCoils({ coilIds, limit = TRACE_JOINT_LIMIT }: { coilIds: number[]; limit?: number }, trx?: Db): Promise<{ joints: TracedJoint[]; truncated: boolean }> {
  if (!coilIds.length) return { joints: [], truncated: false };
  const k = conn(trx);
  const ids = [...new Set(coilIds)];
  const placeholders = ids.map(() => "?").join(",");
  const [rows] = (await k.raw(
    `SELECT j.id, j.job_id, j.joint_no, j.kind, j.made_at, j.station, j.latitude, j.longitude,
            j.fuser_id, u.name AS fuser_name, j.outcome, j.replaces_joint_id,
            j.coil_a_id, ca.coil_code AS coil_a_code, ca.lot AS coil_a_lot,
            j.coil_b_id, cb.coil_code AS coil_b_code, cb.lot AS coil_b_lot,
            j.component_b_text, j.length_a_m, j.length_b_m,
            ${JOINT_FACTS_SELECT}
       FROM (SELECT id FROM joints WHERE coil_a_id IN (${placeholders})
             UNION
             SELECT id FROM joints WHERE coil_b_id IN (${placeholders})) AS hit
       JOIN joints j ON j.id = hit.id
       ${JOINT_FACTS_JOINS}
       JOIN users u ON u.id = j.fuser_id
       LEFT JOIN coils ca ON ca.id = j.coil_a_id
       LEFT JOIN coils cb ON cb.id = j.coil_b_id
      ORDER BY jb.code, j.made_at, j.id
      LIMIT ?`,
    [...ids, ...ids, limit + 1],
  )) as [TracedJointRow[]];
  const traced = new Set(ids);
  const joints = rows.slice(0, limit).map((r) => {
    const a = r.coil_a_id == null ? null : Number(r.coil_a_id);
    const b = r.coil_b_id == null ? null : Number(r.coil_b_id);
    const onA = a != null && traced.has(a);
    const onB = b != null && traced.has(b);
    return {
      ...jointFacts(r),
      fuserId: Number(r.fuser_id),
      fuserName: r.fuser_name,
      coilAId: a,
      coilACode: text(r.coil_a_code),
      coilALot: text(r.coil_a_lot),
      coilBId: b,
      coilBCode: text(r.coil_b_code),
      coilBLot: text(r.coil_b_lot),
      side: onA && onB ? "both" : onA ? "a" : "b",
    } satisfies TracedJoint;
  });
  return { joints, truncated: rows.length > limit };
}

/** Lot → ground in one call: the lots, their coils and every joint made with them. */
export async function traceLot(search: { manufacturer?: string; lot?: string; code?: string }, trx?: Db): Promise<LotSearchResult & { joints: TracedJoint[]; truncated: boolean }> {
  const found = await findLotCoils(search, trx);
  const { joints, truncated } = await listJointsForCoils({ coilIds: found.coils.map((c) => c.id) }, trx);
  return { ...found, joints, truncated };
}

/**
 * The joint a parsed reference names (domain/joints/reference): a job code and joint number,
 * a joint id from a tag's address, or a bare number read as a joint id. `isJobOnFile` says,
 * for a job-and-number reference, whether the job itself exists.
 */
export async function findJointIdByReference({ reference }: { reference: JointReference }, trx?: Db): Promise<{ jointId: number | null; isJobOnFile: boolean | null }> {
  const k = conn(trx);
  if (reference.kind === "job-joint") {
    const job = (await k("jobs").where("code", reference.jobCode).first("id")) as { id: number } | undefined;
    if (!job) return { jointId: null, isJobOnFile: false };
    const row = (await k("joints").where({ job_id: job.id, joint_no: reference.jointNo }).first("id")) as { id: number } | undefined;
    return { jointId: row ? Number(row.id) : null, isJobOnFile: true };
  }
  const id = reference.kind === "joint-id" ? reference.jointId : reference.value;
  const row = (await k("joints").where("id", id).first("id")) as { id: number } | undefined;
  return { jointId: row ? Number(row.id) : null, isJobOnFile: null };
}

export type JointOrigins = {
  joint: {
    id: number;
    jobId: number;
    jobCode: string;
    jobName: string;
    jointNo: number;
    kind: TracedJoint["kind"];
    madeAt: Date;
    station: string | null;
    latitude: number | null;
    longitude: number | null;
    outsideDiameterMm: number;
    sdr: number;
    outcome: TracedJoint["outcome"];
    reviewState: TracedJoint["reviewState"];
    replacedBy: JointLink | null;
    replaces: JointLink | null;
    componentBText: string | null;
    lengthAM: number | null;
    lengthBM: number | null;
  };
  /** The inspector's decision the review state rests on (null while pending review). */
  decision: JointDecision | null;
  coilA: Coil | null;
  coilB: Coil | null;
  machine: { id: number; assetTag: string; description: string | null; pistonAreaMm2: number | null; lastServiceOn: string | null; nextServiceDue: string | null };
  heater: {
    id: number;
    assetTag: string;
    description: string | null;
    checkIntervalDays: number;
    /** Last temperature check at or before the joint, or null. */
    lastCheck: { checkedAt: Date; passed: boolean; instrument: string; windowMinC: number; windowMaxC: number; nextDueOn: string; checkedByName: string | null } | null;
  };
  fuser: { id: number; name: string; email: string; qualifiedOn: string[]; failedTestsOn: string[] };
  procedure: { versionId: number; procedureId: number; code: string; name: string; standard: string; versionNo: number; publishedAt: Date; supersededAt: Date | null };
};

/** An inspector's decision on a joint: accepted or cut out, by whom, when, and the note. */
export type JointDecision = { state: "accepted" | "cut-out"; byName: string; at: Date; note: string | null };

/** Joint → origins (raw records; the qualification status is computed by the caller). */
export async function findJointOrigins({ jointId }: { jointId: number }, trx?: Db): Promise<JointOrigins | null> {
  const k = conn(trx);
  const [found] = (await k.raw(`SELECT j.*, ${JOINT_FACTS_SELECT} FROM joints j ${JOINT_FACTS_JOINS} WHERE j.id = ?`, [jointId])) as [OriginJointRow[]];
  const j = found[0];
  if (!j) return null;
  // The latest decision revision, when the joint's state still rests on it (a re-opened joint is pending again).
  const decisionRow =
    j.review_state === "pending-review"
      ? undefined
      : ((await k("joint_revisions as r")
          .join("users as u", "u.id", "r.by_user_id")
          .where("r.joint_id", jointId)
          .whereIn("r.kind", ["accepted", "cut-out"])
          .orderBy("r.revision_no", "desc")
          .first("r.kind", "r.at", "r.reason", "u.name as by_name")) as (Pick<JointRevisionRow, "at" | "reason"> & { kind: JointDecision["state"]; by_name: string }) | undefined);
  const coilIds = [j.coil_a_id, j.coil_b_id].filter((v) => v != null).map(Number);
  const coils = coilIds.length ? ((await coilQuery(trx).whereIn("coils.id", coilIds)) as Parameters<typeof toCoil>[0][]).map(toCoil) : [];
  const coil = (id: unknown) => (id == null ? null : (coils.find((c) => c.id === Number(id)) ?? null));
  const machineId = Number(j.machine_id);
  const heaterId = Number(j.heater_id);
  const versionId = Number(j.procedure_version_id);
  const fuserId = Number(j.fuser_id);
  const machine = (await k("fusion_machines").where("id", machineId).first()) as FusionMachineRow;
  const heater = (await k("heater_plates").where("id", heaterId).first()) as HeaterPlateRow;
  const check = (await k("heater_checks as h")
    .leftJoin("users as u", "u.id", "h.checked_by")
    .where("h.heater_id", heaterId)
    .where("h.checked_at", "<=", j.made_at)
    .orderBy("h.checked_at", "desc")
    .orderBy("h.id", "desc")
    .first("h.*", "u.name as checked_by_name")) as CheckRow | undefined;
  const version = (await k("procedure_versions as v")
    .join("procedures as p", "p.id", "v.procedure_id")
    .where("v.id", versionId)
    .first("v.id", "v.procedure_id", "v.version_no", "v.published_at", "v.superseded_at", "p.code", "p.name", "p.standard")) as VersionRow;
  const procedureId = Number(version.procedure_id);
  const fuser = (await k("users").where("id", fuserId).first("id", "name", "email")) as { id: number; name: string; email: string };
  const quals = (await k("qualifications").where({ user_id: fuserId, procedure_id: procedureId }).orderBy("qualified_on").select("qualified_on")) as { qualified_on: Date }[];
  const fails = (await k("qualification_failures").where({ user_id: fuserId, procedure_id: procedureId }).orderBy("failed_on").select("failed_on")) as { failed_on: Date }[];
  return {
    joint: {
      ...jointFacts(j),
      outsideDiameterMm: Number(j.outside_diameter_mm),
      sdr: Number(j.sdr),
    },
    decision: decisionRow ? { state: decisionRow.kind, byName: decisionRow.by_name, at: decisionRow.at, note: text(decisionRow.reason) } : null,
    coilA: coil(j.coil_a_id),
    coilB: coil(j.coil_b_id),
    machine: {
      id: Number(machine.id),
      assetTag: machine.asset_tag,
      description: machine.description ?? null,
      pistonAreaMm2: num(machine.piston_area_mm2),
      lastServiceOn: isoDay(machine.last_service_on),
      nextServiceDue: isoDay(machine.next_service_due),
    },
    heater: {
      id: Number(heater.id),
      assetTag: heater.asset_tag,
      description: heater.description ?? null,
      checkIntervalDays: Number(heater.check_interval_days),
      lastCheck: check
        ? {
            checkedAt: check.checked_at,
            passed: Boolean(check.passed),
            instrument: check.instrument,
            windowMinC: Number(check.window_min_c),
            windowMaxC: Number(check.window_max_c),
            nextDueOn: day(check.next_due_on),
            checkedByName: check.checked_by_name ?? null,
          }
        : null,
    },
    fuser: { id: Number(fuser.id), name: fuser.name, email: fuser.email, qualifiedOn: quals.map((q) => day(q.qualified_on)), failedTestsOn: fails.map((f) => day(f.failed_on)) },
    procedure: {
      versionId: Number(version.id),
      procedureId: Number(version.procedure_id),
      code: version.code,
      name: version.name,
      standard: version.standard,
      versionNo: Number(version.version_no),
      publishedAt: version.published_at,
      supersededAt: version.superseded_at ?? null,
    },
  };
}

/** Joints made with one coil (either side), newest first, for the coil page. */
export async function listJointsForCoil({ coilId, limit = 200 }: { coilId: number; limit?: number }, trx?: Db): Promise<TracedJoint[]> {
  const { joints } = await listJointsForCoils({ coilIds: [coilId], limit }, trx);
  return joints.sort((a, b) => b.madeAt.getTime() - a.madeAt.getTime() || b.id - a.id);
}

type LabelRow = Pick<JointRow, "id" | "joint_no" | "made_at" | "station"> & { job_code: string; job_name: string };

/** Facts a joint tag label prints (joint number, job, date, station). */
export async function findJointLabelFacts({ jointIds }: { jointIds: number[] }, trx?: Db): Promise<{ id: number; jointNo: number; jobCode: string; jobName: string; madeAt: Date; station: string | null }[]> {
  if (!jointIds.length) return [];
  const rows = (await conn(trx)("joints as j")
    .join("jobs as jb", "jb.id", "j.job_id")
    .whereIn("j.id", jointIds)
    .select("j.id", "j.joint_no", "jb.code as job_code", "jb.name as job_name", "j.made_at", "j.station")) as LabelRow[];
  const byId = new Map(rows.map((r) => [Number(r.id), r]));
  return jointIds
    .map((id) => byId.get(id))
    .filter((r): r is LabelRow => Boolean(r))
    .map((r) => ({ id: Number(r.id), jointNo: Number(r.joint_no), jobCode: r.job_code, jobName: r.job_name, madeAt: r.made_at, station: r.station ?? null }));
}
