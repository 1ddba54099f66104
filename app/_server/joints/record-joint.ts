// Record one joint made at the trench: the use case behind recordJointAction and
// POST /api/v1/joints. It loads what the rules need, asks the domain (qualification on the
// joint's date, size mismatch, blocking warnings and their overrides, pressure plan, joint
// check — never the device's verdict), then writes the joint, its first revision, its state,
// the coil pulls, the photo links, the override uses, the audit entry and (out of limits)
// the inspectors' alert in ONE transaction. Joint numbers come from the job's counter row
// locked FOR UPDATE, so they are gap-free under concurrent submissions. A client id seen
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
import { findCoilByCodeOrTrace, lockCoil, type Coil } from "@/database/queries/coils";
import { findHeaterWithLastCheck, findMachineById } from "@/database/queries/equipment";
import { findJobById } from "@/database/queries/jobs";
import {
  findJointByClientId,
  findJointById,
  insertJoint,
  insertJointRevision,
  insertJointState,
  insertOverrideUse,
  listOverridesForSubjects,
  listRecentJointsOnCoils,
  lockJointForRemake,
  markJointReplaced,
  takeNextJointNo,
  type JointRecord,
} from "@/database/queries/joints";
import { currentProcedureVersionForJob } from "@/database/queries/procedures";
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
import { drawDownCoil } from "@/app/_server/coils/draw-down-coil";
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

export function describeRecordedJoint(joint: JointRecord, system: UnitSystem): RecordedJoint {
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

async function resolveCoil(text: string, field: "coilA" | "coilB", user: UserRecord): Promise<Coil> {
  const coil = await findCoilByCodeOrTrace({ code: text, preferCrewId: user.crewId });
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
  const version = await currentProcedureVersionForJob({ jobId: job.id });
  if (!version) throw new AppError("conflict", noPublishedVersionMessage(job.code), { jobId: [NO_PUBLISHED_VERSION_FIELD_MESSAGE] });

  const [qualifications, failures, admins, inspectors, machine, heater] = await Promise.all([
    listQualificationsForUser({ userId: user.id, procedureId: job.procedureId }),
    listQualificationFailuresForUser({ userId: user.id, procedureId: job.procedureId }),
    listUsersWithRole({ role: "admin" }),
    listUsersWithRole({ role: "inspector" }),
    findMachineById({ id: input.machineId }),
    findHeaterWithLastCheck({ id: input.heaterId, now: madeAt, timeZone }),
  ]);
  const qualification = qualificationStatus({ qualifiedOn: qualifications.map((q) => q.qualifiedOn), failedTestsOn: failures.map((f) => f.failedOn), on });

  if (!machine) throw invalid("machineId", `Fusion machine ${input.machineId} does not exist.`);
  if (!machine.isUsable) throw invalid("machineId", machine.problems.join(" "));
  if (!heater) throw invalid("heaterId", `Heater plate ${input.heaterId} does not exist.`);

  const coilA = await resolveCoil(input.coilA, "coilA", user);
  const coilB = input.kind === "coil-to-coil" && input.coilB ? await resolveCoil(input.coilB, "coilB", user) : null;
  const problem = preRecordProblems({ sideA: toSide(coilA), sideB: coilB ? toSide(coilB) : null, machine }, user.unitSystem)[0];
  if (problem) throw invalid(problem.field, problem.message);

  const reasons = blockReasons({
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
  return { plan, check, coilA, coilB, procedureVersionId: version.id, jobCode: job.code, covered, sides, submissionSha256: submissionSha256(input, sides) };
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

const MAX_DEADLOCK_RETRIES = 3;

function isDeadlock(error: unknown): boolean {
  const code = (error as { code?: string } | null)?.code;
  return code === "ER_LOCK_DEADLOCK" || code === "ER_LOCK_WAIT_TIMEOUT";
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
  // A cleared quarantined or used-up coil is named but not drawn down; a cleared coil of another crew's job is.
  const coveredCoils = new Set(prepared.covered.filter((c) => c.reason.subject?.type === "coil" && NO_PULL_BLOCKS.includes(c.reason.kind)).map((c) => c.reason.subject!.id));

  for (let attempt = 1; ; attempt += 1) {
    try {
      const jointId = await db().transaction((trx) => writeJoint(trx, input, prepared, { user, madeAt, coveredCoils, requestId: ctx.requestId ?? null, warnings }));
      const joint = await loadJoint(jointId);
      return { created: true, joint: { ...describeRecordedJoint(joint, user.unitSystem), warnings } };
    } catch (error) {
      if (isClientIdDuplicate(error)) {
        // The same client id won a race: the same submission gets its joint, other values a 409.
        const raced = await existingFor(input, user, prepared.sides);
        if (raced) return raced;
      }
      if (isDeadlock(error) && attempt < MAX_DEADLOCK_RETRIES) continue;
      throw error;
    }
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

async function loadJoint(id: number): Promise<JointRecord> {
  const joint = await findJointById({ id });
  if (!joint) throw new Error(`joint ${id} vanished after commit`);
  return joint;
}

async function writeJoint(
  trx: Knex.Transaction,
  input: RecordJointInput,
  p: Prepared,
  ctx: { user: UserRecord; madeAt: Date; coveredCoils: Set<number>; requestId: string | null; warnings: string[] },
): Promise<number> {
  const { user, madeAt } = ctx;
  const jointNo = await takeNextJointNo({ jobId: input.jobId }, trx);
  // Lock the coils in id order before anything references them, so two jobs laying from
  // the same coil queue up instead of deadlocking.
  const coils = [p.coilA, ...(p.coilB ? [p.coilB] : [])].sort((a, b) => a.id - b.id);
  for (const c of coils) await lockCoil({ id: c.id }, trx);

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

  const jointId = await insertJoint(
    {
      clientId: input.clientId,
      jobId: input.jobId,
      jointNo,
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
      replacesJointId: replaces?.id ?? null,
      submissionSha256: p.submissionSha256,
    },
    trx,
  );
  await insertJointRevision(
    { jointId, revisionNo: 1, kind: "recorded", byUserId: user.id, reviewState: "pending-review", changes: { outcome: p.check.outcome, timedFields: input.timedFields, overrides: p.covered.map((c) => c.grant.id) } },
    trx,
  );
  await insertJointState({ jointId, reviewState: "pending-review", revisionNo: 1, outcome: p.check.outcome, madeAt }, trx);
  if (replaces && !(await markJointReplaced({ jointId: replaces.id, replacedByJointId: jointId }, trx))) {
    throw new AppError("conflict", `Joint ${replaces.jointNo} has already been remade.`, { replacesJointId: [`Joint ${replaces.jointNo} has already been remade.`] });
  }

  const pulls: { coilId: number; pullM: number; field: string }[] = [];
  if (input.lengthAM && input.lengthAM > 0 && !ctx.coveredCoils.has(p.coilA.id)) pulls.push({ coilId: p.coilA.id, pullM: input.lengthAM, field: "lengthAM" });
  if (p.coilB && input.lengthBM && input.lengthBM > 0 && !ctx.coveredCoils.has(p.coilB.id)) pulls.push({ coilId: p.coilB.id, pullM: input.lengthBM, field: "lengthBM" });
  const drawn = [];
  for (const pull of pulls.sort((a, b) => a.coilId - b.coilId)) {
    drawn.push(await drawDownCoil({ ...pull, jointId, userId: user.id, jobId: input.jobId, unitSystem: user.unitSystem }, trx));
  }

  const photos = [...new Set(input.photoIds)];
  if (photos.length) {
    const tied = await attachPhotosToJoint({ ids: photos, jointId, userId: user.id }, trx);
    if (tied !== photos.length) throw invalid("photoIds", "One or more photos were not found, were uploaded by someone else or already belong to another joint; upload them again.");
  }
  // One use per grant: a grant on a coil may clear two of its blocks (quarantined and on another crew's job).
  for (const grantId of new Set(p.covered.map((c) => c.grant.id))) {
    const reasons = p.covered.filter((c) => c.grant.id === grantId).map((c) => c.reason);
    await insertOverrideUse({ jointId, overrideId: grantId, blockKind: reasons.map((r) => r.kind).join(","), message: reasons.map((r) => r.message).join(" ") }, trx);
  }
  await insertAuditEntry(
    {
      actorUserId: user.id,
      action: "joint-recorded",
      entityType: "joint",
      entityId: jointId,
      requestId: ctx.requestId,
      details: {
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
        replacesJointId: replaces?.id ?? null,
        timedFields: input.timedFields,
        ...(ctx.warnings.length ? { warnings: ctx.warnings } : {}),
      },
    },
    trx,
  );
  // Inspectors hear of an out-of-limits joint through the mail outbox, written in this
  // transaction: the mail is sent later and can never block recording.
  if (p.check.outcome === "out-of-limits") await enqueueJointAlert({ jointId }, trx);
  return jointId;
}
