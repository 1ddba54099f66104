// The Register's queries: pages of joints under a filter and sort by keyset (seek)
// pagination, the count (exact up to a cap, otherwise "about" the optimizer's estimate while
// the exact count runs in the background), batches for the export, and the lists the filter form offers.
//
// A page is read in two steps. Step 1 finds the ids of the page with as few tables as
// the filter needs, walking one index in sort order and stopping after limit + 1 rows;
// the seek condition is written out in its expanded form (`a < ? OR (a = ? AND id < ?)`)
// because MariaDB does not turn a row-value comparison into an index range. Step 2 loads
// those ids with every joined name. No OFFSET anywhere: page 5,000 costs what page 1 does.
import type { JointParameter } from "@/domain/fusion/parameters";
import {
  dayBounds,
  estimatedCount,
  exactCount,
  isEmptyFilter,
  type KeyValue,
  type RegisterCount,
  type RegisterCursor,
  type RegisterFilter,
  type RegisterJointRef,
  type RegisterRow,
  type RegisterSort,
  type SortDirection,
} from "@/domain/register";
import { readScannedCoilText } from "@/domain/coils/life";
import { parseJointReference } from "@/domain/joints/reference";
import type { Knex } from "knex";
import { conn, type Db } from "../client";
import { date, num, parseJson, recordedValueColumns, setList, text, toRecordedValues, type DbRow } from "./rows";
import type { FusionMachineRow, JobRow, JointRow as JointTableRow, UserRow } from "../tables";

type SortKey = { col: string; nullable: boolean; isDate?: boolean };

/** Columns of each sort, all on `joints` (made_at also on joint_states / joint_findings). */
const SORT_KEYS: Record<RegisterSort, SortKey[]> = {
  madeAt: [{ col: "made_at", nullable: false, isDate: true }],
  number: [
    { col: "job_id", nullable: false },
    { col: "joint_no", nullable: false },
  ],
  pipeSize: [
    { col: "outside_diameter_mm", nullable: false },
    { col: "sdr", nullable: false },
  ],
  heaterTemperature: [{ col: "heater_temperature_c", nullable: true }],
};

/** The largest joint number a bare number in the search is read as (joint_no is an unsigned INT). */
const MAX_JOINT_NO = 999_999_999;

/** Above this many matching coils, a coil condition is left to a subquery, not a list. */
const MAX_COIL_LIST = 2000;
/** Counts are taken exactly in the request up to this many rows (see registerCountCap). */
export const EXACT_COUNT_CAP = 10_000;

type Binding = Knex.RawBinding;
type Sql = { text: string; bindings: Binding[] };

/** A coil condition: a (small) list of ids, or a subquery over coils when the list is long. */
type CoilSet = { ids: number[] } | { subquery: Sql };

type Resolved = {
  filter: RegisterFilter;
  /** The organisation's IANA zone: from/to are its local days. */
  timeZone: string;
  lotCoils: CoilSet | null;
  search: { coils: CoilSet | null; jointNo: number | null; jobJoint: { jobId: number; jointNo: number } | null; jointId: number | null } | null;
  /** True when the filter can match nothing (unknown lot, search matching nothing). */
  isEmpty: boolean;
};

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/**
 * Coils matching each condition (each an index range of coils), as an id list, or as a
 * subquery when more than MAX_COIL_LIST match. Conditions are ORed.
 */
async function coilSet(conditions: Sql[], trx?: Db): Promise<CoilSet | null> {
  const arms = conditions.map((c) => `(SELECT id FROM coils WHERE ${c.text} LIMIT ${MAX_COIL_LIST + 1})`).join(" UNION ");
  const bindings = conditions.flatMap((c) => c.bindings);
  const [rows] = (await conn(trx).raw(arms, bindings)) as unknown as [{ id: number }[]];
  if (rows.length === 0) return null;
  if (rows.length > MAX_COIL_LIST) return { subquery: { text: `SELECT id FROM coils WHERE ${conditions.map((c) => `(${c.text})`).join(" OR ")}`, bindings } };
  return { ids: rows.map((r) => Number(r.id)) };
}

/** Looks up what the lot and the free-text search match before the page query runs. */
async function resolveFilter(filter: RegisterFilter, timeZone: string, trx?: Db): Promise<Resolved> {
  const out: Resolved = { filter, timeZone, lotCoils: null, search: null, isEmpty: false };
  if (filter.lot) {
    out.lotCoils = await coilSet([{ text: "lot = ?", bindings: [filter.lot] }], trx);
    if (!out.lotCoils) out.isEmpty = true;
  }
  if (filter.q) {
    const q = filter.q.trim();
    // A joint reference (domain/joints/reference): "WO-24152 joint 10", "#10", "WO-24152/10",
    // a joint tag's address; digits alone are a joint number across jobs. A coil label's
    // address searches that coil id. Anything else is a coil id or lot prefix.
    const parsed = parseJointReference(q);
    const reference = parsed.ok ? parsed.reference : null;
    if (reference?.kind === "joint-id") {
      out.search = { coils: null, jointNo: null, jobJoint: null, jointId: reference.jointId };
      return out;
    }
    const scanned = readScannedCoilText(q);
    const coilText = scanned.kind === "empty" ? q : scanned.code;
    const prefix = `${escapeLike(coilText)}%`;
    const [coils, job] = await Promise.all([
      coilSet(
        [
          { text: "coil_code LIKE ?", bindings: [prefix] },
          { text: "lot LIKE ?", bindings: [prefix] },
        ],
        trx,
      ),
      reference?.kind === "job-joint" ? (conn(trx)("jobs").where("code", reference.jobCode).first("id") as Promise<{ id: number } | undefined>) : Promise.resolve(null),
    ]);
    const jointNo = reference?.kind === "number" && reference.value <= MAX_JOINT_NO ? reference.value : null;
    const jobJoint = reference?.kind === "job-joint" && job ? { jobId: Number(job.id), jointNo: reference.jointNo } : null;
    out.search = { coils, jointNo, jobJoint, jointId: null };
    if (!coils && jointNo === null && !jobJoint) out.isEmpty = true;
  }
  return out;
}

type Driver = "joints" | "states" | "findings";

/**
 * Which table the page walks. Sorted by date with only review/outcome (or finding)
 * filters, the joint_states (or joint_findings) index gives the page in order; any
 * filter on the joint itself (job, fuser, machine, lot, search) or another sort walks
 * an index of joints.
 */
function chooseDriver(filter: RegisterFilter, sort: RegisterSort): Driver {
  if (sort !== "madeAt") return "joints";
  if (filter.job || filter.fuser || filter.machine || filter.lot || filter.q) return "joints";
  if (filter.finding) return "findings";
  if (filter.outcome || filter.review) return "states";
  return "joints";
}

function coilCondition(set: CoilSet, bindings: Binding[]): string {
  if ("ids" in set) {
    const list = set.ids.map(() => "?").join(",");
    bindings.push(...set.ids, ...set.ids);
    return `(j.coil_a_id IN (${list}) OR j.coil_b_id IN (${list}))`;
  }
  bindings.push(...set.subquery.bindings, ...set.subquery.bindings);
  return `(j.coil_a_id IN (${set.subquery.text}) OR j.coil_b_id IN (${set.subquery.text}))`;
}

type Built = { from: string; where: string[]; bindings: Binding[]; keyCols: string[]; idCol: string; hint: string };

/** FROM and WHERE of step 1 (no seek condition, no order). */
function buildBase(resolved: Resolved, sort: RegisterSort): Built {
  const { filter } = resolved;
  const driver = chooseDriver(filter, sort);
  const bindings: Binding[] = [];
  const where: string[] = [];
  const needsStates = Boolean(filter.outcome || filter.review);
  let from: string;
  let keyCols: string[];
  let idCol: string;
  let dateCol: string;
  let hint = "";

  if (driver === "states") {
    from = "joint_states s";
    keyCols = ["s.made_at"];
    idCol = "s.joint_id";
    dateCol = "s.made_at";
  } else if (driver === "findings") {
    // joint_findings: findings at recording and of later pressure traces (rows.ts jointHasFinding).
    from = "joint_findings f";
    if (needsStates) from += " STRAIGHT_JOIN joint_states s ON s.joint_id = f.joint_id";
    keyCols = ["f.made_at"];
    idCol = "f.joint_id";
    dateCol = "f.made_at";
    where.push("f.parameter = ?");
    bindings.push(filter.finding as string);
  } else {
    // Lot and search: restrict the optimizer to the coil indexes (an index merge of side
    // A and side B, plus joint number), so it does not walk the date index hoping to meet
    // a rare lot early. Only when every coil condition is a short id list.
    const sets = [resolved.lotCoils, resolved.search?.coils].filter((c): c is CoilSet => Boolean(c));
    if ((resolved.lotCoils || resolved.search) && sets.every((c) => "ids" in c)) {
      const indexes = ["joints_coil_a_id_index", "joints_coil_b_id_index"];
      if (resolved.search && resolved.search.jointNo !== null) indexes.push("joints_register_joint_no_index");
      if (resolved.search?.jobJoint) indexes.push("joints_job_id_joint_no_unique");
      if (resolved.search?.jointId) indexes.push("PRIMARY");
      hint = ` USE INDEX (${indexes.join(", ")})`;
    }
    from = `joints j${hint}`;
    if (needsStates) from += " STRAIGHT_JOIN joint_states s ON s.joint_id = j.id";
    if (filter.finding) {
      from += " STRAIGHT_JOIN joint_findings f ON f.joint_id = j.id AND f.parameter = ?";
      bindings.push(filter.finding as string);
    }
    keyCols = SORT_KEYS[sort].map((k) => `j.${k.col}`);
    idCol = "j.id";
    dateCol = "j.made_at";
  }

  if (filter.job) {
    where.push("j.job_id = ?");
    bindings.push(filter.job);
  }
  if (filter.fuser) {
    where.push("j.fuser_id = ?");
    bindings.push(filter.fuser);
  }
  if (filter.machine) {
    where.push("j.machine_id = ?");
    bindings.push(filter.machine);
  }
  if (filter.from) {
    where.push(`${dateCol} >= ?`);
    bindings.push(dayBounds(filter.from, resolved.timeZone).start);
  }
  if (filter.to) {
    where.push(`${dateCol} < ?`);
    bindings.push(dayBounds(filter.to, resolved.timeZone).nextStart);
  }
  if (filter.outcome) {
    where.push("s.outcome = ?");
    bindings.push(filter.outcome);
  }
  if (filter.review) {
    where.push("s.review_state = ?");
    bindings.push(filter.review);
  }
  if (resolved.lotCoils) where.push(coilCondition(resolved.lotCoils, bindings));
  if (resolved.search) {
    const parts: string[] = [];
    if (resolved.search.coils) parts.push(coilCondition(resolved.search.coils, bindings));
    if (resolved.search.jointNo !== null) {
      parts.push("j.joint_no = ?");
      bindings.push(resolved.search.jointNo);
    }
    if (resolved.search.jobJoint) {
      parts.push("(j.job_id = ? AND j.joint_no = ?)");
      bindings.push(resolved.search.jobJoint.jobId, resolved.search.jobJoint.jointNo);
    }
    if (resolved.search.jointId) {
      parts.push("j.id = ?");
      bindings.push(resolved.search.jointId);
    }
    where.push(`(${parts.join(" OR ")})`);
  }
  return { from, where, bindings, keyCols, idCol, hint };
}

/**
 * The seek condition "strictly after the cursor row" in expanded form: for keys k1..kn
 * and id, the OR over i of (k1 = v1 AND … AND k(i-1) = v(i-1) AND ki ⋗ vi). NULLs sort
 * first ascending and last descending (MariaDB), which the nullable cases follow.
 */
export function seekCondition(cols: { expr: string; nullable: boolean }[], values: Binding[], dir: SortDirection): Sql {
  const bindings: Binding[] = [];
  const disjuncts: string[] = [];
  const op = dir === "asc" ? ">" : "<";
  for (let i = 0; i < cols.length; i += 1) {
    const terms: string[] = [];
    const local: Binding[] = [];
    for (let e = 0; e < i; e += 1) {
      if (values[e] === null) terms.push(`${cols[e].expr} IS NULL`);
      else {
        terms.push(`${cols[e].expr} = ?`);
        local.push(values[e]);
      }
    }
    const { expr, nullable } = cols[i];
    const v = values[i];
    if (v === null) {
      if (dir === "desc") continue; // nothing sorts after NULL when descending
      terms.push(`${expr} IS NOT NULL`);
    } else if (nullable && dir === "desc") {
      terms.push(`(${expr} < ? OR ${expr} IS NULL)`);
      local.push(v);
    } else {
      terms.push(`${expr} ${op} ?`);
      local.push(v);
    }
    disjuncts.push(terms.length === 1 ? terms[0] : `(${terms.join(" AND ")})`);
    bindings.push(...local);
  }
  return { text: disjuncts.length ? `(${disjuncts.join(" OR ")})` : "FALSE", bindings };
}

function seekFor(built: Built, sort: RegisterSort, cursor: RegisterCursor): Sql {
  const keys = SORT_KEYS[sort];
  const cols = [...keys.map((k, i) => ({ expr: built.keyCols[i], nullable: k.nullable })), { expr: built.idCol, nullable: false }];
  // Timestamps travel in the cursor as epoch milliseconds.
  const values: Binding[] = [...keys.map((k, i) => (k.isDate && cursor.keys[i] !== null ? new Date(cursor.keys[i] as number) : cursor.keys[i])), cursor.id];
  return seekCondition(cols, values, cursor.dir);
}

function orderBy(built: Built, dir: SortDirection): string {
  const d = dir === "asc" ? "ASC" : "DESC";
  return [...built.keyCols, built.idCol].map((c) => `${c} ${d}`).join(", ");
}

type PageStep1 = { ids: number[]; last: { id: number; keys: KeyValue[] } | null; hasMore: boolean };

async function pageIds(resolved: Resolved, sort: RegisterSort, dir: SortDirection, after: RegisterCursor | undefined, limit: number, trx?: Db): Promise<PageStep1> {
  const built = buildBase(resolved, sort);
  const where = [...built.where];
  const bindings = [...built.bindings];
  if (after) {
    const seek = seekFor(built, sort, after);
    where.push(seek.text);
    bindings.push(...seek.bindings);
  }
  const select = [`${built.idCol} AS id`, ...built.keyCols.map((c, i) => `${c} AS k${i}`)].join(", ");
  const sql = `SELECT ${select} FROM ${built.from}${where.length ? ` WHERE ${where.join(" AND ")}` : ""} ORDER BY ${orderBy(built, dir)} LIMIT ${limit + 1}`;
  const [rows] = (await conn(trx).raw(sql, bindings)) as unknown as [DbRow[]];
  const hasMore = rows.length > limit;
  const page = hasMore ? rows.slice(0, limit) : rows;
  const lastRow = page[page.length - 1];
  const last = lastRow
    ? {
        id: Number(lastRow.id),
        keys: SORT_KEYS[sort].map((k, i) => {
          const v = lastRow[`k${i}`];
          if (v === null || v === undefined) return null;
          return k.isDate ? (v as Date).getTime() : Number(v);
        }),
      }
    : null;
  return { ids: page.map((r) => Number(r.id)), last, hasMore };
}

/** A row of ROW_SELECT: the joint with its job, fuser, equipment, coils, procedure and state. */
type JointRow = Omit<JointTableRow, "outcome"> & {
  job_code: string;
  fuser_name: string;
  machine_tag: string;
  heater_tag: string;
  coil_a_code: string | null;
  coil_a_lot: string | null;
  coil_a_nominal_size: string | null;
  coil_a_series: string | null;
  coil_b_code: string | null;
  coil_b_lot: string | null;
  procedure_code: string;
  procedure_version_no: number;
  outcome: RegisterRow["outcome"];
  review_state: RegisterRow["reviewState"];
} & AuditRow;

// ── Audit trail (decision, remakes, overrides) ──
/** The audit columns of ROW_SELECT. */
type AuditRow = {
  replaces_joint_no: number | null;
  replaces_job_code: string | null;
  replaced_by_joint_no: number | null;
  replaced_by_job_code: string | null;
  decision_kind: "accepted" | "cut-out" | null;
  decided_at: Date | null;
  decision_note: string | null;
  decided_by_name: string | null;
  /** JSON array of { message, reason, by }: parsed already by the client's JSON type cast, or text; NULL for none. */
  overrides_used: OverrideJson[] | string | null;
};

type OverrideJson = { message: string; reason: string; by: string };

const AUDIT_SELECT = `
  rj.joint_no AS replaces_joint_no, rjb.code AS replaces_job_code,
  nj.joint_no AS replaced_by_joint_no, njb.code AS replaced_by_job_code,
  d.kind AS decision_kind, d.at AS decided_at, d.reason AS decision_note, di.name AS decided_by_name,
  ov.overrides_used`;

/**
 * The audit joins for one batch of ids (`ids` is its placeholder list, bound twice
 * before the WHERE's own list). Remakes are primary-key lookups. The decision is the
 * latest accepted/cut-out revision, found by one grouped read of joint_revisions over the
 * batch (its unique (joint_id, revision_no) index), and only while the joint's state still
 * rests on it; overrides are one grouped read of joint_override_uses (primary key
 * joint_id, override_id). No query per joint.
 */
function auditFrom(ids: string): string {
  return `
  LEFT JOIN joints rj ON rj.id = j.replaces_joint_id
  LEFT JOIN jobs rjb ON rjb.id = rj.job_id
  LEFT JOIN joints nj ON nj.id = s.replaced_by_joint_id
  LEFT JOIN jobs njb ON njb.id = nj.job_id
  LEFT JOIN (SELECT joint_id, MAX(revision_no) AS revision_no FROM joint_revisions
              WHERE joint_id IN (${ids}) AND kind IN ('accepted', 'cut-out') GROUP BY joint_id) dl
         ON dl.joint_id = j.id AND s.review_state IN ('accepted', 'cut-out')
  LEFT JOIN joint_revisions d ON d.joint_id = dl.joint_id AND d.revision_no = dl.revision_no
  LEFT JOIN users di ON di.id = d.by_user_id
  LEFT JOIN (SELECT ou.joint_id, JSON_ARRAYAGG(JSON_OBJECT('message', ou.message, 'reason', o.reason, 'by', g.name) ORDER BY o.id) AS overrides_used
               FROM joint_override_uses ou JOIN joint_overrides o ON o.id = ou.override_id JOIN users g ON g.id = o.granted_by
              WHERE ou.joint_id IN (${ids}) GROUP BY ou.joint_id) ov
         ON ov.joint_id = j.id`;
}

const ref = (jobCode: string | null, jointNo: number | null): RegisterJointRef | null => (jobCode == null || jointNo == null ? null : { jobCode, jointNo: Number(jointNo) });

function toAudit(r: AuditRow): Pick<RegisterRow, "decisionState" | "decidedByName" | "decidedAt" | "decisionNote" | "replaces" | "replacedBy" | "overridesUsed"> {
  return {
    decisionState: r.decision_kind ?? null,
    decidedByName: text(r.decided_by_name),
    decidedAt: date(r.decided_at),
    decisionNote: text(r.decision_note),
    replaces: ref(r.replaces_job_code, r.replaces_joint_no),
    replacedBy: ref(r.replaced_by_job_code, r.replaced_by_joint_no),
    overridesUsed: (Array.isArray(r.overrides_used) ? r.overrides_used : parseJson<OverrideJson[]>(r.overrides_used, [])).map((o) => ({ message: String(o.message), grantedByName: String(o.by), reason: String(o.reason) })),
  };
}
// ── end audit trail ──

const ROW_SELECT = `
  j.id, j.job_id, jb.code AS job_code, j.joint_no, j.kind, j.made_at, j.station, j.latitude, j.longitude,
  j.fuser_id, u.name AS fuser_name, j.machine_id, m.asset_tag AS machine_tag, h.asset_tag AS heater_tag,
  ca.coil_code AS coil_a_code, ca.lot AS coil_a_lot, ca.nominal_size AS coil_a_nominal_size, ca.series AS coil_a_series,
  cb.coil_code AS coil_b_code, cb.lot AS coil_b_lot, j.component_b_text,
  j.outside_diameter_mm, j.sdr, j.procedure_version_id, p.code AS procedure_code, pv.version_no AS procedure_version_no,
  COALESCE(s.outcome, j.outcome) AS outcome, COALESCE(s.review_state, 'pending-review') AS review_state, j.finding_parameters,
  j.ambient_c, ${recordedValueColumns("j").join(", ")},${AUDIT_SELECT}`;

const ROW_FROM = `
  joints j
  LEFT JOIN joint_states s ON s.joint_id = j.id
  JOIN jobs jb ON jb.id = j.job_id
  JOIN users u ON u.id = j.fuser_id
  JOIN fusion_machines m ON m.id = j.machine_id
  JOIN heater_plates h ON h.id = j.heater_id
  LEFT JOIN coils ca ON ca.id = j.coil_a_id
  LEFT JOIN coils cb ON cb.id = j.coil_b_id
  JOIN procedure_versions pv ON pv.id = j.procedure_version_id
  JOIN procedures p ON p.id = pv.procedure_id`;

function toRegisterRow(r: JointRow): RegisterRow {
  return {
    id: Number(r.id),
    jobId: Number(r.job_id),
    jobCode: r.job_code,
    jointNo: Number(r.joint_no),
    kind: r.kind,
    madeAt: r.made_at,
    station: text(r.station),
    latitude: num(r.latitude),
    longitude: num(r.longitude),
    fuserId: Number(r.fuser_id),
    fuserName: r.fuser_name,
    machineId: Number(r.machine_id),
    machineTag: r.machine_tag,
    heaterTag: r.heater_tag,
    coilACode: text(r.coil_a_code),
    coilALot: text(r.coil_a_lot),
    coilBCode: text(r.coil_b_code),
    coilBLot: text(r.coil_b_lot),
    componentBText: text(r.component_b_text),
    nominalSize: text(r.coil_a_nominal_size),
    series: text(r.coil_a_series),
    outsideDiameterMm: Number(r.outside_diameter_mm),
    sdr: Number(r.sdr),
    procedureVersionId: Number(r.procedure_version_id),
    procedureCode: r.procedure_code,
    procedureVersionNo: Number(r.procedure_version_no),
    outcome: r.outcome,
    reviewState: r.review_state,
    findingParameters: setList<JointParameter>(r.finding_parameters),
    ambientC: num(r.ambient_c),
    ...toRecordedValues(r),
    ...toAudit(r),
  };
}

/** Register rows for these joint ids, in the order given. */
/**
 * Ids per lookup. MariaDB turns an IN list longer than in_predicate_conversion_threshold
 * (1000) into a join with a derived table and may then start the join from a small
 * table; below it the list is a primary-key range and every other table an eq_ref.
 */
const IDS_PER_LOOKUP = 500;

export async function findRegisterRowsByIds({ ids }: { ids: number[] }, trx?: Db): Promise<RegisterRow[]> {
  if (ids.length === 0) return [];
  const byId = new Map<number, RegisterRow>();
  for (let i = 0; i < ids.length; i += IDS_PER_LOOKUP) {
    const chunk = ids.slice(i, i + IDS_PER_LOOKUP);
    const list = chunk.map(() => "?").join(",");
    const [rows] = (await conn(trx).raw(`SELECT ${ROW_SELECT} FROM ${ROW_FROM}${auditFrom(list)} WHERE j.id IN (${list})`, [...chunk, ...chunk, ...chunk])) as unknown as [JointRow[]];
    for (const r of rows) byId.set(Number(r.id), toRegisterRow(r));
  }
  return ids.map((id) => byId.get(id)).filter((r): r is RegisterRow => Boolean(r));
}

export type RegisterPage = { rows: RegisterRow[]; next: RegisterCursor | null; count?: RegisterCount };

/**
 * One page of the register under `filter`, in `sort`/`dir` order, strictly after the
 * cursor `after` (the first page without one). `next` is null on the last page. With
 * `withCount`, the count (see countRegister) is taken alongside.
 */
export async function listRegisterPage(
  {
    filter,
    timeZone,
    sort = "madeAt",
    dir = "desc",
    after,
    limit = 100,
    withCount = false,
  }: { filter: RegisterFilter; timeZone: string; sort?: RegisterSort; dir?: SortDirection; after?: RegisterCursor; limit?: number; withCount?: boolean },
  trx?: Db,
): Promise<RegisterPage> {
  const resolved = await resolveFilter(filter, timeZone, trx);
  if (resolved.isEmpty) return { rows: [], next: null, ...(withCount ? { count: exactCount(0) } : {}) };
  const page = async () => {
    const step1 = await pageIds(resolved, sort, dir, after, limit, trx);
    const rows = await findRegisterRowsByIds({ ids: step1.ids }, trx);
    const next = step1.hasMore && step1.last ? { sort, dir, keys: step1.last.keys, id: step1.last.id } : null;
    return { rows, next };
  };
  if (!withCount) return page();
  const [p, count] = await Promise.all([page(), countResolved(resolved, registerCountCap(), true, trx)]);
  return { ...p, count };
}

/**
 * Every row of the filter in order, in batches (keyset pages), for the export: memory
 * stays at one batch whatever the row count.
 */
export async function* iterateRegisterRows(
  { filter, timeZone, sort = "madeAt", dir = "desc", batchSize = 2000 }: { filter: RegisterFilter; timeZone: string; sort?: RegisterSort; dir?: SortDirection; batchSize?: number },
  trx?: Db,
): AsyncGenerator<RegisterRow[]> {
  const resolved = await resolveFilter(filter, timeZone, trx);
  if (resolved.isEmpty) return;
  let after: RegisterCursor | undefined;
  for (;;) {
    const step1 = await pageIds(resolved, sort, dir, after, batchSize, trx);
    if (step1.ids.length) yield await findRegisterRowsByIds({ ids: step1.ids }, trx);
    if (!step1.hasMore || !step1.last) return;
    after = { sort, dir, keys: step1.last.keys, id: step1.last.id };
  }
}

export type { RegisterCount };

/**
 * Counts are exact up to this many rows when taken in the request; above it the answer is
 * "about" the optimizer's estimate while the exact count runs in the background.
 * REGISTER_EXACT_COUNT_CAP overrides it (tests set it low).
 */
export function registerCountCap(): number {
  const fromEnv = Number(process.env.REGISTER_EXACT_COUNT_CAP);
  return Number.isInteger(fromEnv) && fromEnv > 0 ? fromEnv : EXACT_COUNT_CAP;
}

/** The background exact count stops after this long (MariaDB max_statement_time); REGISTER_EXACT_COUNT_TIMEOUT_S overrides. */
const EXACT_COUNT_TIMEOUT_S = 120;
function exactCountTimeoutSeconds(): number {
  const fromEnv = Number(process.env.REGISTER_EXACT_COUNT_TIMEOUT_S);
  return Number.isFinite(fromEnv) && fromEnv > 0 ? fromEnv : EXACT_COUNT_TIMEOUT_S;
}

/**
 * How many joints match: exact up to `cap` (a count that stops there, so it stays cheap);
 * above it, an exact count already taken for this filter and this state of the joints, or
 * else the optimizer's estimate marked not exact, while an exact count is started in the
 * background (`background: false` leaves it out).
 */
export async function countRegister(
  { filter, timeZone, cap = registerCountCap(), background = true }: { filter: RegisterFilter; timeZone: string; cap?: number; background?: boolean },
  trx?: Db,
): Promise<RegisterCount> {
  const resolved = await resolveFilter(filter, timeZone, trx);
  if (resolved.isEmpty) return exactCount(0);
  return countResolved(resolved, cap, background, trx);
}

/**
 * Estimates of large counts, kept for a short while in this process: a filter known to
 * match more than the cap a moment ago skips its capped count. Never shown as a count.
 */
const ESTIMATE_TTL_MS = 30_000;
const estimates = new Map<string, { value: number; at: number }>();

function rememberEstimate(key: string, value: number): void {
  if (estimates.size > 500) estimates.clear();
  estimates.set(key, { value, at: Date.now() });
}

/**
 * Exact counts taken in the background, per filter, each stamped with the version of the
 * joints it was taken at (the largest joint id and the largest revision id: a new joint, a
 * correction, a decision or a trace each add a row there, so any change that can move a
 * count changes the version). An exact count is answered only for the version it was taken
 * at (kept EXACT_TTL_MS); after a change, the last exact count is the "about" value until
 * the new one is in. One count runs per filter at a time in this process (single flight),
 * at most MAX_RUNNING in all, and a filter is counted again no sooner than the cool-down
 * after its last count (so steady recording does not keep the database counting); a count
 * that failed or timed out is not retried for FAILED_TTL_MS. Each app instance keeps its
 * own map, so instances may each take a count once.
 */
const EXACT_TTL_MS = 10 * 60_000;
const FAILED_TTL_MS = 2 * 60_000;
const MAX_RUNNING = 3;
/** REGISTER_EXACT_COUNT_COOLDOWN_MS overrides (tests set 0). */
function cooldownMs(): number {
  const raw = process.env.REGISTER_EXACT_COUNT_COOLDOWN_MS;
  const fromEnv = raw ? Number(raw) : NaN;
  return Number.isFinite(fromEnv) && fromEnv >= 0 ? fromEnv : 5_000;
}
type FilterCounts = { running: boolean; endedAt: number; last: { version: string; value: number; at: number } | null; failedAt: number | null };
const exactCounts = new Map<string, FilterCounts>();
let running = 0;

async function jointsVersion(): Promise<string> {
  const [rows] = (await conn().raw(`SELECT (SELECT MAX(id) FROM joints) AS j, (SELECT MAX(id) FROM joint_revisions) AS r`)) as unknown as [{ j: number | null; r: number | null }[]];
  return `${rows[0]?.j ?? 0}.${rows[0]?.r ?? 0}`;
}

/** Starts the exact count of `inner` for the filter at `version`, unless one runs, the cool-down holds or too many run. */
function startExactCount(filterKey: string, version: string, inner: string, bindings: Binding[]): void {
  let entry = exactCounts.get(filterKey);
  if (entry?.running || (entry && Date.now() - entry.endedAt < cooldownMs()) || running >= MAX_RUNNING) return;
  if (!entry) {
    if (exactCounts.size > 500) for (const [k, e] of exactCounts) if (!e.running) exactCounts.delete(k);
    entry = { running: false, endedAt: 0, last: null, failedAt: null };
    exactCounts.set(filterKey, entry);
  }
  const e = entry;
  e.running = true;
  running += 1;
  const seconds = exactCountTimeoutSeconds();
  void (async () => {
    try {
      const [rows] = (await conn().raw(`SET STATEMENT max_statement_time=${seconds} FOR SELECT COUNT(*) AS n FROM (${inner}) matching`, bindings)) as unknown as [{ n: number }[]];
      e.last = { version, value: Number(rows[0]?.n ?? 0), at: Date.now() };
      e.failedAt = null;
    } catch {
      e.failedAt = Date.now();
    } finally {
      e.running = false;
      e.endedAt = Date.now();
      running -= 1;
    }
  })();
}

/** Waits until no background count runs (tests). */
export async function settleRegisterCounts(timeoutMs = 30_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (running > 0 && Date.now() < until) await new Promise((r) => setTimeout(r, 20));
}

async function countResolved(resolved: Resolved, cap: number, background: boolean, trx?: Db): Promise<RegisterCount> {
  const { filter } = resolved;
  const built = buildBase(resolved, "madeAt");
  const whereSql = built.where.length ? ` WHERE ${built.where.join(" AND ")}` : "";
  const inner = `SELECT 1 FROM ${built.from}${whereSql}`;
  const filterKey = `${inner}|${JSON.stringify(built.bindings)}`;
  // Inside a caller's transaction the background count (on the pool) could not see its
  // rows: no cache and no background count there.
  const useBackground = background && !trx;
  const version = useBackground ? await jointsVersion() : null;
  const known = useBackground ? exactCounts.get(filterKey) : undefined;
  if (known?.last && known.last.version === version && Date.now() - known.last.at < EXACT_TTL_MS) return exactCount(known.last.value);

  const estimateKey = `${cap}|${filterKey}`;
  let estimate = estimates.get(estimateKey);
  if (!estimate || Date.now() - estimate.at >= ESTIMATE_TTL_MS) {
    if (!isEmptyFilter(filter)) {
      const [rows] = (await conn(trx).raw(`SELECT COUNT(*) AS n FROM (${inner} LIMIT ${cap + 1}) capped`, built.bindings)) as unknown as [{ n: number }[]];
      const n = Number(rows[0]?.n ?? 0);
      if (n <= cap) return exactCount(n);
    }
    const [plan] = (await conn(trx).raw(`EXPLAIN ${inner}`, built.bindings)) as unknown as [{ rows: number | null; filtered: number | null }[]];
    let guess = 1;
    for (const step of plan) guess *= Number(step.rows ?? 1) * (Number(step.filtered ?? 100) / 100);
    if (isEmptyFilter(filter) && guess <= cap) {
      // Small register: count exactly.
      const [rows] = (await conn(trx).raw(`SELECT COUNT(*) AS n FROM joints`)) as unknown as [{ n: number }[]];
      return exactCount(Number(rows[0]?.n ?? 0));
    }
    rememberEstimate(estimateKey, Math.max(Math.round(guess), cap + 1));
    estimate = estimates.get(estimateKey);
  }
  // The last exact count (of an older version) is a better "about" than the optimizer's.
  const value = known?.last?.value ?? estimate?.value ?? cap + 1;
  if (!version) return estimatedCount(value, false);
  if (known?.failedAt && !known.running && Date.now() - known.failedAt < FAILED_TTL_MS) return estimatedCount(value, false);
  // When the cool-down or the limit keeps it from starting now, a later ask starts it.
  startExactCount(filterKey, version, inner, built.bindings);
  return estimatedCount(value, true);
}

export type RegisterOption = { id: number; label: string };
export type RegisterFilterOptions = { jobs: RegisterOption[]; fusers: RegisterOption[]; machines: RegisterOption[] };

/** What the filter form offers: jobs, people who hold the fuser role, fusion machines. */
export async function listRegisterFilterOptions(_: Record<string, never> = {}, trx?: Db): Promise<RegisterFilterOptions> {
  // One round trip for the three lists; each part keeps its own order and limit.
  const [rows] = (await conn(trx).raw(
    `(SELECT 'job' AS list, id, CONCAT(code, ' — ', name) AS label, code AS sort_key FROM jobs ORDER BY code LIMIT 5000)
     UNION ALL (SELECT 'fuser', id, name, name FROM users WHERE FIND_IN_SET('fuser', roles) > 0 ORDER BY name LIMIT 5000)
     UNION ALL (SELECT 'machine', id, asset_tag, asset_tag FROM fusion_machines ORDER BY asset_tag LIMIT 5000)
     ORDER BY list, sort_key`,
  )) as [{ list: "job" | "fuser" | "machine"; id: number; label: string }[]];
  const options: RegisterFilterOptions = { jobs: [], fusers: [], machines: [] };
  const into = { job: options.jobs, fuser: options.fusers, machine: options.machines };
  for (const r of rows) into[r.list].push({ id: Number(r.id), label: r.label });
  return options;
}

export type RegisterFilterNames = { job: string | null; fuser: string | null; machine: string | null };

/** Names of the job, fuser and machine a filter refers to by id (for the export's filter sheet). */
export async function findRegisterFilterNames({ filter }: { filter: RegisterFilter }, trx?: Db): Promise<RegisterFilterNames> {
  const k = conn(trx);
  const [job, fuser, machine] = await Promise.all([
    filter.job ? (k("jobs").where("id", filter.job).first("code", "name") as Promise<Pick<JobRow, "code" | "name"> | undefined>) : null,
    filter.fuser ? (k("users").where("id", filter.fuser).first("name") as Promise<Pick<UserRow, "name"> | undefined>) : null,
    filter.machine ? (k("fusion_machines").where("id", filter.machine).first("asset_tag") as Promise<Pick<FusionMachineRow, "asset_tag"> | undefined>) : null,
  ]);
  return {
    job: job ? `${job.code} — ${job.name}` : null,
    fuser: fuser ? fuser.name : null,
    machine: machine ? machine.asset_tag : null,
  };
}
