// Record one joint made at the trench: the use case behind recordJointAction and
// POST /api/v1/joints. It loads what the rules need, asks the domain (qualification on the
// joint's date, size mismatch, blocking warnings and their overrides, pressure plan, joint
// check — never the device's verdict), then writes the joint, its first revision, its state,
// the coil pulls, the photo links, the override uses, the audit entry and (out of limits)
// the inspectors' alert in ONE short transaction: everything that can be decided before it is
// decided before it (prepare), and inside it the job's counter row is locked last, just before
// the joint is inserted, so the numbers are gap-free under concurrent submissions while other
// submissions on the job wait only for the inserts (see writeJoint). A client id seen
// before returns the joint it made when the submission is the same (its SHA-256 fingerprint,
// domain/joints/submission), also when two copies race; with other values it is refused
// (409) naming the fields that differ.
import { withInstrument } from "@/domain/fusion/instrument";
import "server-only";
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { attachPhotosToJoint } from "@/database/queries/attachments";
import { findCoilByCodeOrTrace, insertPullEvents, lockCoils, type Coil } from "@/database/queries/coils";
import { findHeaterWithLastCheck, findMachineById } from "@/database/queries/equipment";
import { findJobById } from "@/database/queries/jobs";
import {
  findJointByClientId,
  findJointById,
  insertJoint,
  recordedValuesAsStored,
  insertJointRevision,
  insertJointState,
  insertOverrideUses,
  listOverridesForSubjects,
  listRecentJointsOnCoils,
  lockJointForRemake,
  markJointReplaced,
  takeNextJointNo,
  type JointRecord,
  type NewJoint,
} from "@/database/queries/joints";
import { currentProcedureVersion } from "@/database/queries/procedures";
import { listQualificationFailuresForUser, listQualificationsForUser } from "@/database/queries/qualifications";
import { listUsersWithRole, type UserRecord } from "@/database/queries/users";
import { checkJoint, type JointCheck } from "@/domain/fusion/check";
import { planButtFusion, type FusionPlan } from "@/domain/fusion/plan";
import { buttFusionPlanInput, NO_PUBLISHED_VERSION_FIELD_MESSAGE, noPublishedVersionMessage, preRecordProblems } from "@/domain/joints/pre-record";
import { applyOverrides, blockReasons, madeAtProblem, NO_PULL_BLOCKS } from "@/domain/joints/rules";
import { reusedClientIdMessage, submissionDifferences, submissionFingerprintText, type ResolvedSides } from "@/domain/joints/submission";
import { pickRecordedValues, type RecordedValues } from "@/domain/joints/values";
import type { RecordJointInput } from "@/domain/joints/schemas";
import { jobBlockReason } from "@/domain/jobs/rules";
import { HANDLING_WAIT_MINUTES, handlingWaitWarnings } from "@/domain/procedures/handling";
import { qualificationStatus } from "@/domain/qualifications/status";
import { AppError } from "@/domain/result";
import type { UnitSystem } from "@/domain/units/format";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { drawDownLockedCoil, type DrawDownResult } from "@/app/_server/coils/draw-down-coil";
import { enqueueJointAlert } from "@/app/_server/mail/joint-alert";

/** What the device and the API get back: the server's verdict in the caller's units. */
export type RecordedJoint = {
  id: number;
  clientId: string;
  jobId: number;
  jobCode: string;
  jointNo: number;
  madeAt: string;
  outcome: JointCheck["outcome"];
  findings: { parameter: string; kind: string; message: string; measured: number | boolean | null; limit: { min: number | null; max: number | null } | null }[];
  reviewState: JointRecord["reviewState"];
  procedure: string;
  replacesJointId: number | null;
  replacesJointNo: number | null;
  /** What the fuser must do now, in words. */
  advice: string;
  /** Cautions that do not change the verdict (pipe pulled within the handling wait); only on the response that recorded the joint. */
  warnings: string[];
  url: string;
};

export type RecordJointResult = { created: boolean; joint: RecordedJoint };

/** Re-check a stored joint for display in `system` (messages in the reader's units). */
export function verdictOf(joint: Pick<JointRecord, "plan" | "ambientC" | "shelter"> & RecordedValues, system: UnitSystem): JointCheck {
  return checkJoint(joint.plan, pickRecordedValues(joint), { system, conditions: { ambientC: joint.ambientC, shelter: joint.shelter } });
}

/** What describeRecordedJoint reads of a joint: a stored one, or the one just written (recordJoint). */
export type DescribableJoint = RecordedValues &
  Pick<JointRecord, "id" | "clientId" | "jobId" | "jobCode" | "jointNo" | "madeAt" | "plan" | "ambientC" | "shelter" | "reviewState" | "procedureCode" | "procedureVersionNo" | "replacesJointId" | "replacesJointNo">;

export function describeRecordedJoint(joint: DescribableJoint, system: UnitSystem): RecordedJoint {
  const check = verdictOf(joint, system);
  const procedure = `${joint.procedureCode} v${joint.procedureVersionNo}`;
  const advice =
    check.outcome === "within-limits"
      ? `Joint ${joint.jointNo} on ${joint.jobCode} is within the limits of ${procedure}. It waits for an inspector's review like every joint.`
      : `Joint ${joint.jointNo} on ${joint.jobCode} is out of limits. Cut it out and remake it per ${procedure}; record the remake as replacing joint ${joint.jointNo}. An inspector has been told.`;
  return {
    id: joint.id,
    clientId: joint.clientId,
    jobId: joint.jobId,
    jobCode: joint.jobCode,
    jointNo: joint.jointNo,
    madeAt: joint.madeAt.toISOString(),
    outcome: check.outcome,
    findings: check.findings.map((f) => ({ parameter: f.parameter, kind: f.kind, message: f.message, measured: f.measured, limit: f.limit })),
    reviewState: joint.reviewState,
    procedure,
    replacesJointId: joint.replacesJointId,
    replacesJointNo: joint.replacesJointNo,
    advice,
    warnings: [],
    url: `/joints/${joint.id}`,
  };
}

const invalid = (field: string, message: string) => new AppError("invalid", message, { [field]: [message] });

function namesOf(users: { name: string }[]): string[] {
  return users.map((u) => u.name);
}

function coilOnFile(coil: Coil | null, text: string, field: "coilA" | "coilB"): Coil {
  if (!coil) throw invalid(field, `No coil "${text.slice(0, 60)}" is on file: check the label, or type our coil id (such as LV-C0001).`);
  return coil;
}

const toSide = (c: Coil) => ({ id: c.id, code: c.coilCode, outsideDiameterMm: c.outsideDiameterMm, sdr: c.sdr });

type Prepared = {
  plan: FusionPlan;
  check: JointCheck;
  coilA: Coil;
  coilB: Coil | null;
  procedureVersionId: number;
  procedureCode: string;
  procedureVersionNo: number;
  jobCode: string;
  covered: ReturnType<typeof applyOverrides>["covered"];
  /** The coils the side texts named, and the submission's fingerprint (SHA-256 hex). */
  sides: ResolvedSides;
  submissionSha256: string;
};

/** Everything that can be decided before the transaction: refusals come out as AppErrors. */
async function prepare(input: RecordJointInput, user: UserRecord, madeAt: Date): Promise<Prepared> {
  // The crew's local day in the organisation's zone (the device judges the same day).
  const timeZone = await organisationTimeZone();
  const on = isoDateIn(madeAt, timeZone);
  const job = await findJobById({ id: input.jobId });
  if (!job) throw invalid("jobId", `Job ${input.jobId} does not exist.`);
  const closed = jobBlockReason(job);
  if (closed) throw new AppError("conflict", closed, { jobId: [closed] });
  if (job.crewId !== null && job.crewId !== user.crewId) {
    throw new AppError("forbidden", `Job ${job.code} belongs to the ${job.crewName ?? "another"} crew; you can record joints only on your own crew's jobs.`, { jobId: [`Job ${job.code} is not one of your crew's jobs.`] });
  }
  const version = await currentProcedureVersion({ procedureId: job.procedureId });
  if (!version) throw new AppError("conflict", noPublishedVersionMessage(job.code), { jobId: [NO_PUBLISHED_VERSION_FIELD_MESSAGE] });

  // The lookups that do not depend on each other go out together; their refusals are judged
  // afterwards in the order the form reads (machine, heater, coil A, coil B).
  const coilBText = input.kind === "coil-to-coil" && input.coilB ? input.coilB : null;
  const [qualifications, failures, machine, heater, foundA, foundB] = await Promise.all([
    listQualificationsForUser({ userId: user.id, procedureId: job.procedureId }),
    listQualificationFailuresForUser({ userId: user.id, procedureId: job.procedureId }),
    findMachineById({ id: input.machineId }),
    findHeaterWithLastCheck({ id: input.heaterId, now: madeAt, timeZone }),
    findCoilByCodeOrTrace({ code: input.coilA, preferCrewId: user.crewId }),
    coilBText ? findCoilByCodeOrTrace({ code: coilBText, preferCrewId: user.crewId }) : Promise.resolve(null),
  ]);
  const qualification = qualificationStatus({ qualifiedOn: qualifications.map((q) => q.qualifiedOn), failedTestsOn: failures.map((f) => f.failedOn), on });

  if (!machine) throw invalid("machineId", `Fusion machine ${input.machineId} does not exist.`);
  if (!machine.isUsable) throw invalid("machineId", machine.problems.join(" "));
  if (!heater) throw invalid("heaterId", `Heater plate ${input.heaterId} does not exist.`);

  const coilA = coilOnFile(foundA, input.coilA, "coilA");
  const coilB = coilBText ? coilOnFile(foundB, coilBText, "coilB") : null;
  const problem = preRecordProblems({ sideA: toSide(coilA), sideB: coilB ? toSide(coilB) : null, machine }, user.unitSystem)[0];
  if (problem) throw invalid(problem.field, problem.message);

  // The names of whom to ask appear only in the words of a block: read them only when there is one.
  const reasonsWith = (admins: UserRecord[], inspectors: UserRecord[]) => blockReasons({
    qualification,
    procedureLabel: `${version.procedureCode} (${version.procedureName})`,
    heater: { id: heater.id, assetTag: heater.assetTag, isActive: heater.isActive, lastCheck: heater.lastCheck ? { passed: heater.lastCheck.passed, nextDueOn: heater.lastCheck.nextDueOn } : null },
    coils: [coilA, ...(coilB ? [coilB] : [])].map((c) => ({
      id: c.id,
      code: c.coilCode,
      status: c.status,
      statusReason: c.statusReason,
      remainingM: c.remainingM,
      assignedJob: c.jobId === null ? null : { id: c.jobId, code: c.jobCode ?? `job ${c.jobId}`, name: c.jobName ?? "", crewId: c.jobCrewId, crewName: c.jobCrewName },
    })),
    // The recording crew: the job's, or the fuser's on a job without a crew.
    job: { id: job.id, crewId: job.crewId ?? user.crewId },
    on,
    admins: namesOf(admins),
    inspectors: namesOf(inspectors.length ? inspectors : admins),
  });
  let reasons = reasonsWith([], []);
  if (reasons.length) {
    const [admins, inspectors] = await Promise.all([listUsersWithRole({ role: "admin" }), listUsersWithRole({ role: "inspector" })]);
    reasons = reasonsWith(admins, inspectors);
  }
  const refusal = reasons.find((r) => r.severity === "refuse");
  if (refusal) {
    if (refusal.kind === "qualification") throw new AppError("forbidden", refusal.message, { _form: [refusal.message] });
    throw invalid("heaterId", refusal.message);
  }
  const subjects = reasons.filter((r) => r.subject).map((r) => r.subject!);
  // Nobody clears their own block: a grant by the fuser (an inspector who also fuses) does not count.
  const grants = (await listOverridesForSubjects({ jobId: job.id, subjects, madeAt })).filter((g) => g.grantedById !== user.id);
  const { open, covered } = applyOverrides(reasons, grants, { jobId: job.id, madeAt });
  if (open.length) {
    const message = open.map((r) => r.message).join(" ");
    throw new AppError("conflict", message, { override: open.map((r) => r.message) });
  }

  // An impossible pipe for this procedure throws a DomainError: the wrapper answers 422.
  const plan = withInstrument(planButtFusion(buttFusionPlanInput({ procedure: version.definition, pipe: coilA, machine: { pistonAreaMm2: machine.pistonAreaMm2 as number }, dragPressureMpa: input.dragPressureMpa })), machine);
  // The server's own check, messages in SI for the record (screens re-check in their units).
  const check = checkJoint(plan, pickRecordedValues(input), { system: "si", conditions: { ambientC: input.ambientC, shelter: input.shelter } });
  const sides = { coilAId: coilA.id, coilBId: coilB?.id ?? null };
  return { plan, check, coilA, coilB, procedureVersionId: version.id, procedureCode: version.procedureCode, procedureVersionNo: version.versionNo, jobCode: job.code, covered, sides, submissionSha256: submissionSha256(input, sides) };
}

/** SHA-256 (hex) of the submission's canonical text (domain/joints/submission). */
function submissionSha256(input: RecordJointInput, sides: ResolvedSides): string {
  return createHash("sha256").update(submissionFingerprintText(input, sides), "utf8").digest("hex");
}

/** The coils a submission's side texts name (null where none is on file), to compare it with a recorded joint. */
async function sidesOf(input: RecordJointInput, user: UserRecord): Promise<ResolvedSides> {
  const idOf = async (text: string | null | undefined) => (text ? ((await findCoilByCodeOrTrace({ code: text, preferCrewId: user.crewId }))?.id ?? null) : null);
  return { coilAId: await idOf(input.coilA), coilBId: input.kind === "coil-to-coil" ? await idOf(input.coilB) : null };
}

function isClientIdDuplicate(error: unknown): boolean {
  return isDuplicateKey(error) && /client_id/i.test(String((error as { sqlMessage?: string; message?: string }).sqlMessage ?? (error as Error).message));
}

/**
 * The joint this client id already made, when the submission is that joint sent again; null
 * when the id is new. The same submission is the same fingerprint; a joint recorded before
 * fingerprints were kept has none and is compared value by value (submissionDifferences, at
 * the resolution it is stored at). Another person's id, or other values under this one, is
 * refused (409): the fields that differ are named, each in words, and nothing is written.
 */
async function existingFor(input: RecordJointInput, user: UserRecord, known?: ResolvedSides): Promise<RecordJointResult | null> {
  const existing = await findJointByClientId({ clientId: input.clientId });
  if (!existing) return null;
  if (existing.fuser.id !== user.id) {
    throw new AppError("conflict", "This submission id was already used for a joint by someone else. Nothing was recorded from this submission; send it as a new joint (a new submission id).", { clientId: ["Already used by another person's joint."] });
  }
  const sides = known ?? (await sidesOf(input, user));
  const differences = submissionDifferences(existing, input, sides, user.unitSystem);
  const same = existing.submissionSha256 !== null ? existing.submissionSha256 === submissionSha256(input, sides) : differences.length === 0;
  if (same) return { created: false, joint: describeRecordedJoint(existing, user.unitSystem) };
  const message = reusedClientIdMessage(existing, differences);
  const fields: Record<string, string[]> = { clientId: [message] };
  for (const d of differences) (fields[d.field] ??= []).push(d.message);
  throw new AppError("conflict", message, fields);
}

/**
 * Records the joint. Input is the parsed recordJointSchema (SI). Throws AppError:
 * invalid (422, named field), forbidden (403: lapsed qualification, another crew's job),
 * conflict (409: blocking warning not yet cleared, closed job, joint already remade).
 */
export async function recordJoint(input: RecordJointInput, ctx: { user: UserRecord; requestId?: string; now?: Date }): Promise<RecordJointResult> {
  const { user } = ctx;
  const now = ctx.now ?? new Date();
  const seen = await existingFor(input, user);
  if (seen) return seen;

  const madeAt = new Date(input.madeAt);
  const when = madeAtProblem(madeAt, now);
  if (when) throw invalid("madeAt", when);

  const prepared = await prepare(input, user, madeAt);
  const warnings = await handlingWarnings(input, prepared, madeAt);
  const rows = jointRows(input, prepared, { user, madeAt, requestId: ctx.requestId ?? null, warnings });

  // db().transaction reruns the whole write on a deadlock or a cluster certification
  // failure (database/client.ts), so a conflict never reaches here as such.
  try {
    const written = await db().transaction((trx) => writeJoint(trx, input, rows, user));
    const joint = (await asWritten(input, prepared, written)) ?? (await loadJoint(written.jointId));
    return { created: true, joint: { ...describeRecordedJoint(joint, user.unitSystem), warnings } };
  } catch (error) {
    if (isClientIdDuplicate(error)) {
      // The same client id won a race: the same submission gets its joint, other values a 409.
      const raced = await existingFor(input, user, prepared.sides);
      if (raced) return raced;
    }
    throw error;
  }
}

/** The handling-wait warnings for the coils this joint pulls pipe from (domain/procedures/handling). */
async function handlingWarnings(input: RecordJointInput, p: Prepared, madeAt: Date): Promise<string[]> {
  const pulled = [...(input.lengthAM && input.lengthAM > 0 ? [p.coilA] : []), ...(p.coilB && input.lengthBM && input.lengthBM > 0 ? [p.coilB] : [])];
  if (!pulled.length) return [];
  const since = new Date(madeAt.getTime() - HANDLING_WAIT_MINUTES * 60_000);
  const recent = await listRecentJointsOnCoils({ coilIds: pulled.map((c) => c.id), since, until: madeAt });
  const codeOf = new Map(pulled.map((c) => [c.id, c.coilCode]));
  return handlingWaitWarnings(pulled.map((c) => c.coilCode), recent.map((r) => ({ ...r, coilCode: codeOf.get(r.coilId) ?? "" })), madeAt);
}

/**
 * The joint as findJointById would read it back right after the commit, built from what was
 * written (the numbers rounded as their columns keep them, the plan through JSON as stored),
 * so the answer needs no read after the transaction; null when a number's stored form cannot
 * be predicted (the caller reads the joint then).
 */
async function asWritten(input: RecordJointInput, p: Prepared, written: Written): Promise<DescribableJoint | null> {
  const values = await recordedValuesAsStored({ ...pickRecordedValues(input), ambientC: input.ambientC });
  if (!values) return null;
  return {
    ...values,
    id: written.jointId,
    clientId: input.clientId,
    jobId: input.jobId,
    jobCode: p.jobCode,
    jointNo: written.jointNo,
    madeAt: new Date(input.madeAt),
    plan: JSON.parse(JSON.stringify(p.plan)) as FusionPlan,
    shelter: input.shelter,
    reviewState: "pending-review",
    procedureCode: p.procedureCode,
    procedureVersionNo: p.procedureVersionNo,
    replacesJointId: written.replacesJointId,
    replacesJointNo: written.replacesJointNo,
  };
}

async function loadJoint(id: number): Promise<JointRecord> {
  const joint = await findJointById({ id });
  if (!joint) throw new Error(`joint ${id} vanished after commit`);
  return joint;
}

/** The rows a joint writes, made before the transaction; only the ids and the number wait for it. */
type JointRows = {
  /** The joint row without its number and the joint it replaces (known inside the transaction). */
  joint: Omit<NewJoint, "jointNo" | "replacesJointId">;
  /** The coils it names, ascending id, and the pulls off them (ascending coil id). */
  coilIds: number[];
  pulls: { coilId: number; pullM: number; field: string }[];
  photoIds: number[];
  revisionChanges: Record<string, unknown>;
  overrideUses: { overrideId: number; blockKind: string; message: string }[];
  outcome: JointCheck["outcome"];
  /** The audit entry's details once the number, the pulls and the replaced joint are known. */
  auditDetails: (known: { jointNo: number; pulls: DrawDownResult[]; replacesJointId: number | null }) => Record<string, unknown>;
  requestId: string | null;
};

function jointRows(input: RecordJointInput, p: Prepared, ctx: { user: UserRecord; madeAt: Date; requestId: string | null; warnings: string[] }): JointRows {
  const { user, madeAt } = ctx;
  // A cleared quarantined or used-up coil is named but not drawn down; a cleared coil of another crew's job is.
  const coveredCoils = new Set(p.covered.filter((c) => c.reason.subject?.type === "coil" && NO_PULL_BLOCKS.includes(c.reason.kind)).map((c) => c.reason.subject!.id));
  const pulls: JointRows["pulls"] = [];
  if (input.lengthAM && input.lengthAM > 0 && !coveredCoils.has(p.coilA.id)) pulls.push({ coilId: p.coilA.id, pullM: input.lengthAM, field: "lengthAM" });
  if (p.coilB && input.lengthBM && input.lengthBM > 0 && !coveredCoils.has(p.coilB.id)) pulls.push({ coilId: p.coilB.id, pullM: input.lengthBM, field: "lengthBM" });
  pulls.sort((a, b) => a.coilId - b.coilId);
  const photos = [...new Set(input.photoIds)];
  // One use per grant: a grant on a coil may clear two of its blocks (quarantined and on another crew's job).
  const overrideUses = [...new Set(p.covered.map((c) => c.grant.id))].map((grantId) => {
    const reasons = p.covered.filter((c) => c.grant.id === grantId).map((c) => c.reason);
    return { overrideId: grantId, blockKind: reasons.map((r) => r.kind).join(","), message: reasons.map((r) => r.message).join(" ") };
  });
  return {
    joint: {
      clientId: input.clientId,
      jobId: input.jobId,
      kind: input.kind,
      coilAId: p.coilA.id,
      coilBId: p.coilB?.id ?? null,
      componentBText: input.kind === "coil-to-coil" ? null : (input.componentBText ?? null),
      lengthAM: input.lengthAM ?? null,
      lengthBM: input.lengthBM ?? null,
      outsideDiameterMm: p.coilA.outsideDiameterMm,
      sdr: p.coilA.sdr,
      procedureVersionId: p.procedureVersionId,
      machineId: input.machineId,
      heaterId: input.heaterId,
      fuserId: user.id,
      madeAt,
      station: input.station ?? null,
      latitude: input.latitude ?? null,
      longitude: input.longitude ?? null,
      ambientC: input.ambientC,
      shelter: input.shelter,
      ...pickRecordedValues(input),
      timedFields: [...new Set(input.timedFields)],
      plan: p.plan,
      outcome: p.check.outcome,
      findings: p.check.findings,
      submissionSha256: p.submissionSha256,
    },
    coilIds: [...new Set([p.coilA.id, ...(p.coilB ? [p.coilB.id] : [])])].sort((a, b) => a - b),
    pulls,
    photoIds: photos,
    revisionChanges: { outcome: p.check.outcome, timedFields: input.timedFields, overrides: p.covered.map((c) => c.grant.id) },
    overrideUses,
    outcome: p.check.outcome,
    auditDetails: ({ jointNo, pulls: drawn, replacesJointId }) => ({
      clientId: input.clientId,
      jobId: input.jobId,
      jobCode: p.jobCode,
      jointNo,
      outcome: p.check.outcome,
      findings: p.check.findings.map((f) => f.parameter),
      coils: [p.coilA.coilCode, p.coilB?.coilCode].filter(Boolean),
      pulls: drawn.map((d) => ({ coil: d.coilCode, pulledM: d.pulledM, remainingM: d.remainingM })),
      photos,
      overrides: p.covered.map((c) => ({ id: c.grant.id, kind: c.reason.kind })),
      replacesJointId,
      timedFields: input.timedFields,
      ...(ctx.warnings.length ? { warnings: ctx.warnings } : {}),
    }),
    requestId: ctx.requestId,
  };
}

/**
 * The transaction: writes only, in an order that keeps the job's counter row locked for as
 * short a time as the inserts allow. (1) The joint's coils, in id order in one statement
 * (FOR UPDATE when pipe is pulled from one, shared otherwise), then the joint a remake
 * replaces, are locked and judged; the coils' lengths are written. (2) Only then is the
 * counter bumped (takeNextJointNo, one statement), and the joint and what hangs on its id
 * (revision 1, state, the replaced joint's link, coil events, photos, override uses, audit
 * entry, alert) are inserted, and the transaction commits. The joint row needs its number
 * when inserted (joints is append-only: the application may not UPDATE it), so the number
 * cannot be set after the dependent rows. Every writer takes coils before joints before
 * counters, so no two submissions wait on each other in a circle. A refusal anywhere rolls
 * everything back, the counter's bump with it.
 */
/** What only the transaction knows: the joint's id and number, and the joint it replaces. */
type Written = { jointId: number; jointNo: number; replacesJointId: number | null; replacesJointNo: number | null };

async function writeJoint(trx: Knex.Transaction, input: RecordJointInput, rows: JointRows, user: UserRecord): Promise<Written> {
  const coils = await lockCoils({ ids: rows.coilIds, exclusive: rows.pulls.length > 0 }, trx);

  let replaces: Awaited<ReturnType<typeof lockJointForRemake>> = null;
  if (input.replacesJointId) {
    replaces = await lockJointForRemake({ id: input.replacesJointId }, trx);
    if (!replaces) throw invalid("replacesJointId", `Joint ${input.replacesJointId} does not exist.`);
    if (replaces.jobId !== input.jobId) throw invalid("replacesJointId", `Joint ${replaces.jointNo} is on another job; a remake replaces a joint on the same job.`);
    if (replaces.outcome === "within-limits" && replaces.reviewState !== "cut-out") {
      throw invalid("replacesJointId", `Joint ${replaces.jointNo} is within limits and was not cut out; there is nothing to remake.`);
    }
    if (replaces.replacedByJointId) throw new AppError("conflict", `Joint ${replaces.jointNo} has already been remade.`, { replacesJointId: [`Joint ${replaces.jointNo} has already been remade.`] });
  }

  const drawn: DrawDownResult[] = [];
  for (const pull of rows.pulls) {
    drawn.push(await drawDownLockedCoil({ ...pull, coil: coils.get(pull.coilId), jobId: input.jobId, unitSystem: user.unitSystem }, trx));
  }

  // The last lock: from here to commit, other submissions on this job wait.
  const jointNo = await takeNextJointNo({ jobId: input.jobId }, trx);
  const jointId = await insertJoint({ ...rows.joint, jointNo, replacesJointId: replaces?.id ?? null }, trx);
  await insertJointRevision({ jointId, revisionNo: 1, kind: "recorded", byUserId: user.id, reviewState: "pending-review", changes: rows.revisionChanges }, trx);
  await insertJointState({ jointId, reviewState: "pending-review", revisionNo: 1, outcome: rows.outcome, madeAt: rows.joint.madeAt }, trx);
  if (replaces && !(await markJointReplaced({ jointId: replaces.id, replacedByJointId: jointId }, trx))) {
    throw new AppError("conflict", `Joint ${replaces.jointNo} has already been remade.`, { replacesJointId: [`Joint ${replaces.jointNo} has already been remade.`] });
  }
  await insertPullEvents({ pulls: drawn, jointId, userId: user.id }, trx);
  if (rows.photoIds.length) {
    const tied = await attachPhotosToJoint({ ids: rows.photoIds, jointId, userId: user.id }, trx);
    if (tied !== rows.photoIds.length) throw invalid("photoIds", "One or more photos were not found, were uploaded by someone else or already belong to another joint; upload them again.");
  }
  await insertOverrideUses(rows.overrideUses.map((u) => ({ jointId, ...u })), trx);
  await insertAuditEntry(
    { actorUserId: user.id, action: "joint-recorded", entityType: "joint", entityId: jointId, requestId: rows.requestId, details: rows.auditDetails({ jointNo, pulls: drawn, replacesJointId: replaces?.id ?? null }) },
    trx,
  );
  // Inspectors hear of an out-of-limits joint through the mail outbox, written in this
  // transaction: the mail is sent later and can never block recording.
  if (rows.outcome === "out-of-limits") await enqueueJointAlert({ jointId }, trx);
  return { jointId, jointNo, replacesJointId: replaces?.id ?? null, replacesJointNo: replaces?.jointNo ?? null };
}
