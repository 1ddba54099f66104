// Trace, both directions. Lot → ground: the coils of a lot and every joint made with them
// on either side (coil_a_id or coil_b_id) — two indexed lookups joined by UNION, never an
// OR across the two columns, so it stays fast on millions of joints. Joint → origins: the
// two components with their lots and receipt inspections, machine, heater plate and its
// last check before the joint, the fuser's qualification records, the procedure version.
import { lotMatch, readScannedCoilText, type LotMatch } from "@/domain/coils/life";
import { traceCodeLotField } from "@/domain/trace-code/trace-code";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { JointKind } from "@/domain/joints/schemas";
import type { ReviewState } from "@/domain/joints/review-states";
import { conn, type Db } from "../client";
import { coilQuery, findCoilByCode, listCoilsByTraceCode, toCoil, type Coil } from "./coils";
import type { FusionMachineRow, HeaterCheckRow, HeaterPlateRow, JointRow } from "../tables";
import { day, isoDay, num } from "./rows";

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
  reviewState: ReviewState | null;
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

/** A row of listJointsForCoils' SELECT (joints with their job, fuser, state and coils). */
type TracedJointRow = Pick<JointRow, "id" | "job_id" | "joint_no" | "kind" | "made_at" | "station" | "latitude" | "longitude" | "fuser_id" | "outcome" | "coil_a_id" | "coil_b_id" | "component_b_text" | "length_a_m" | "length_b_m"> & {
  job_code: string;
  job_name: string;
  fuser_name: string;
  review_state: TracedJoint["reviewState"];
  coil_a_code: string | null;
  coil_a_lot: string | null;
  coil_b_code: string | null;
  coil_b_lot: string | null;
};

/** findJointOrigins' joint row: the joint with its job and review state. */
type OriginJointRow = JointRow & { job_code: string; job_name: string; review_state: TracedJoint["reviewState"] };

/** The heater check row with the name of who made it. */
type CheckRow = HeaterCheckRow & { checked_by_name: string | null };

/** The procedure version row with its procedure's code, name and standard. */
type VersionRow = { id: number; procedure_id: number; version_no: number; published_at: Date; superseded_at: Date | null; code: string; name: string; standard: string };

/**
 * Every joint made with any of the coils, on either side, ordered by job, time, id. The
 * ids come from `coil_a_id IN (…) UNION coil_b_id IN (…)` — each arm uses its own index.
 * At most `limit` joints (default 50,000); `truncated` says when more exist.
 */
/**
 * The joint facts the lot trace and a joint's origins both show, from a row of joints with
 * its job (job_code, job_name) and state (review_state; null when none yet).
 */
function jointFacts(r: Record<string, unknown>) {
  return {
    id: Number(r.id),
    jobId: Number(r.job_id),
    jobCode: r.job_code as string,
    jobName: r.job_name as string,
    jointNo: Number(r.joint_no),
    kind: r.kind as TracedJoint["kind"],
    madeAt: r.made_at as Date,
    station: (r.station as string | null) ?? null,
    latitude: r.latitude == null ? null : Number(r.latitude),
    longitude: r.longitude == null ? null : Number(r.longitude),
    outcome: r.outcome as TracedJoint["outcome"],
    reviewState: (r.review_state as TracedJoint["reviewState"]) ?? null,
    componentBText: (r.component_b_text as string | null) ?? null,
    lengthAM: r.length_a_m == null ? null : Number(r.length_a_m),
    lengthBM: r.length_b_m == null ? null : Number(r.length_b_m),
  };
}

export async function listJointsForCoils({ coilIds, limit = TRACE_JOINT_LIMIT }: { coilIds: number[]; limit?: number }, trx?: Db): Promise<{ joints: TracedJoint[]; truncated: boolean }> {
  if (!coilIds.length) return { joints: [], truncated: false };
  const k = conn(trx);
  const ids = [...new Set(coilIds)];
  const placeholders = ids.map(() => "?").join(",");
  const [rows] = (await k.raw(
    `SELECT j.id, j.job_id, jb.code AS job_code, jb.name AS job_name, j.joint_no, j.kind, j.made_at, j.station, j.latitude, j.longitude,
            j.fuser_id, u.name AS fuser_name, j.outcome, s.review_state,
            j.coil_a_id, ca.coil_code AS coil_a_code, ca.lot AS coil_a_lot,
            j.coil_b_id, cb.coil_code AS coil_b_code, cb.lot AS coil_b_lot,
            j.component_b_text, j.length_a_m, j.length_b_m
       FROM (SELECT id FROM joints WHERE coil_a_id IN (${placeholders})
             UNION
             SELECT id FROM joints WHERE coil_b_id IN (${placeholders})) AS hit
       JOIN joints j ON j.id = hit.id
       JOIN jobs jb ON jb.id = j.job_id
       JOIN users u ON u.id = j.fuser_id
       LEFT JOIN joint_states s ON s.joint_id = j.id
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
      fuserName: r.fuser_name as string,
      coilAId: a,
      coilACode: r.coil_a_code ?? null,
      coilALot: r.coil_a_lot ?? null,
      coilBId: b,
      coilBCode: (r.coil_b_code as string | null) ?? null,
      coilBLot: (r.coil_b_lot as string | null) ?? null,
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
 * A joint named as people write it: its id ("1234"), or job code and joint number
 * ("WO-24117 #12", "WO-24117-12", "WO-24117 12"). null when none matches.
 */
export async function findJointIdByReference({ reference }: { reference: string }, trx?: Db): Promise<number | null> {
  const text = reference.trim();
  if (!text) return null;
  const k = conn(trx);
  const byJob = /^(.+?)\s*(?:#|\s|-|\/)\s*#?(\d+)$/.exec(text);
  if (byJob) {
    const row = (await k("joints as j").join("jobs as jb", "jb.id", "j.job_id").where("jb.code", byJob[1]!.trim()).where("j.joint_no", Number(byJob[2])).first("j.id")) as { id: number } | undefined;
    if (row) return Number(row.id);
  }
  const joint = /\/joints\/(\d+)/.exec(text) ?? /^#?(\d+)$/.exec(text);
  if (joint) {
    const row = (await k("joints").where("id", Number(joint[1])).first("id")) as { id: number } | undefined;
    if (row) return Number(row.id);
  }
  return null;
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
    componentBText: string | null;
    lengthAM: number | null;
    lengthBM: number | null;
  };
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

/** Joint → origins (raw records; the qualification status is computed by the caller). */
export async function findJointOrigins({ jointId }: { jointId: number }, trx?: Db): Promise<JointOrigins | null> {
  const k = conn(trx);
  const j = (await k("joints as j")
    .join("jobs as jb", "jb.id", "j.job_id")
    .leftJoin("joint_states as s", "s.joint_id", "j.id")
    .where("j.id", jointId)
    .first("j.*", "jb.code as job_code", "jb.name as job_name", "s.review_state")) as OriginJointRow | undefined;
  if (!j) return null;
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
