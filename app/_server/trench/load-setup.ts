// Everything the Trench screen needs on the device, loaded once per page view so the
// fuser can keep working when the signal drops: open jobs with their procedure and the
// fuser's qualification dates, machines, heater plates with their last check, the crew's
// coils, current overrides, joints waiting for a remake, the joints already made between
// two of those coils, and the fuser's latest joints.
import "server-only";
import { listHeatersWithLastCheck, listMachines } from "@/database/queries/equipment";
import { listOpenJobsForFuser } from "@/database/queries/jobs";
import { listCoilsForTrench, listJoints, listJointsAwaitingRemake, listJointsBetweenCoils, listOverridesForJobs } from "@/database/queries/joints";
import { listQualificationFailuresForUser, listQualificationsForUser } from "@/database/queries/qualifications";
import { listUsersWithRoles, type UserRecord } from "@/database/queries/users";
import { toTrenchCoil, type TrenchSetup } from "./setup-types";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { currentProcedureVersions } from "@/app/_server/reference/procedure-versions";

export async function loadTrenchSetup(user: UserRecord, now = new Date()): Promise<TrenchSetup> {
  const [jobs, timeZone] = await Promise.all([listOpenJobsForFuser({ userId: user.id, crewId: user.crewId }), organisationTimeZone()]);
  const jobIds = jobs.map((j) => j.id);
  const [qualifications, failures, machines, heaters, coils, overrides, remakes, recent, reviewers, versions] = await Promise.all([
    listQualificationsForUser({ userId: user.id }),
    listQualificationFailuresForUser({ userId: user.id }),
    listMachines({ activeOnly: true }),
    listHeatersWithLastCheck({ now, timeZone, activeOnly: true }),
    listCoilsForTrench({ crewId: user.crewId, jobIds }),
    listOverridesForJobs({ jobIds, at: now }),
    listJointsAwaitingRemake({ jobIds }),
    listJoints({ fuserId: user.id, limit: 10 }),
    listUsersWithRoles({ roles: ["inspector", "admin"] }),
    // Each job's current procedure version (kept by the server between requests).
    currentProcedureVersions(jobs.map((j) => j.procedureId)),
  ]);
  const pairs = await listJointsBetweenCoils({ coilIds: coils.map((c) => c.id) });
  const inspectors = reviewers.filter((u) => u.roles.includes("inspector"));
  const admins = reviewers.filter((u) => u.roles.includes("admin"));
  return {
    user: { id: user.id, name: user.name, unitSystem: user.unitSystem, crewId: user.crewId },
    jobs: jobs.map((j, i) => {
      const v = versions[i];
      return {
        id: j.id,
        code: j.code,
        name: j.name,
        place: j.place,
        crewId: j.crewId,
        procedure: v ? { versionId: v.id, code: v.procedureCode, name: v.procedureName, versionNo: v.versionNo, definition: v.definition } : null,
        qualifiedOn: qualifications.filter((q) => q.procedureId === j.procedureId).map((q) => q.qualifiedOn),
        failedOn: failures.filter((f) => f.procedureId === j.procedureId).map((f) => f.failedOn),
      };
    }),
    machines: machines.map((m) => ({ id: m.id, assetTag: m.assetTag, description: m.description, pistonAreaMm2: m.pistonAreaMm2, gaugeResolutionMpa: m.gaugeResolutionMpa, thermometerResolutionC: m.thermometerResolutionC, minOdMm: m.minOdMm, maxOdMm: m.maxOdMm, isUsable: m.isUsable, problems: m.problems })),
    heaters: heaters.map((h) => ({ id: h.id, assetTag: h.assetTag, description: h.description, isActive: h.isActive, lastCheck: h.lastCheck ? { passed: h.lastCheck.passed, nextDueOn: h.lastCheck.nextDueOn, checkedAt: h.lastCheck.checkedAt.toISOString() } : null })),
    coils: coils.map(toTrenchCoil),
    overrides: overrides.map((o) => ({ id: o.id, jobId: o.jobId, subjectType: o.subjectType, subjectId: o.subjectId, subjectLabel: o.subjectLabel, reason: o.reason, grantedById: o.grantedById, grantedByName: o.grantedByName, grantedAt: o.grantedAt.toISOString(), expiresAt: o.expiresAt.toISOString() })),
    remakes: remakes.map((r) => ({ id: r.id, jobId: r.jobId, jointNo: r.jointNo, madeAt: r.madeAt.toISOString(), reviewState: r.reviewState, coilACode: r.coilACode, findings: r.findings.map((f) => f.message) })),
    pairs: pairs.map((p) => ({ id: p.id, jointNo: p.jointNo, jobId: p.jobId, coilACode: p.coilACode, coilBCode: p.coilBCode, madeAt: p.madeAt.toISOString(), outcome: p.outcome, reviewState: p.reviewState, replacedByJointId: p.replacedByJointId })),
    recent: recent.map((j) => ({ id: j.id, jobCode: j.jobCode, jointNo: j.jointNo, madeAt: j.madeAt.toISOString(), outcome: j.outcome, reviewState: j.reviewState })),
    inspectors: inspectors.map((u) => u.name),
    admins: admins.map((u) => u.name),
    timeZone,
    loadedAt: now.toISOString(),
  };
}
