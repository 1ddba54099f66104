"use client";
// What keeps the joint from being recorded: the open blocks (qualification, heater check,
// coil states, a coil of another crew's job) less the overrides granted by someone else, sides that do not match, the
// same coil on both sides, and a pipe size the machine does not take.
import { useMemo } from "react";
import { preRecordProblems } from "@/domain/joints/pre-record";
import { applyOverrides, blockReasons } from "@/domain/joints/rules";
import { isoDateIn } from "@/domain/dates/zone";
import { qualificationStatus } from "@/domain/qualifications/status";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";
import type { useFusionPlanPreview } from "./use-fusion-plan-preview";
import type { SideCoils } from "./use-trench-draft";

type Preview = ReturnType<typeof useFusionPlanPreview>;

export function useRecordBlocks(setup: TrenchSetup, { job, machine, heater }: Pick<Preview, "job" | "machine" | "heater">, coils: SideCoils, kind: unknown, now: number) {
  const system = setup.user.unitSystem;
  const userId = setup.user.id;
  const sideB = kind === "coil-to-coil" ? coils.B : null;

  // The local calendar day (organisation's zone) the qualification and heater checks are
  // judged on, taken as the server's record-joint takes it (not a display text, so not
  // components/ui/display-format).
  const today = isoDateIn(new Date(now || Date.parse(setup.loadedAt)), setup.timeZone);
  const blocks = useMemo(() => {
    if (!job) {
      // No job chosen yet: a fuser refused on every open job is told so at once.
      const refusals = setup.jobs.flatMap((j) =>
        blockReasons({ qualification: qualificationStatus({ qualifiedOn: j.qualifiedOn, failedTestsOn: j.failedOn, on: today }), procedureLabel: j.procedure ? `${j.procedure.code} (${j.procedure.name})` : j.code, heater: null, coils: [], on: today, admins: setup.admins, inspectors: [] }),
      );
      const everyJob = refusals.length > 0 && refusals.length === setup.jobs.length;
      return { open: everyJob ? refusals.filter((r, i) => refusals.findIndex((o) => o.message === r.message) === i) : [], covered: [] };
    }
    const qualification = qualificationStatus({ qualifiedOn: job.qualifiedOn, failedTestsOn: job.failedOn, on: today });
    const reasons = blockReasons({
      qualification,
      procedureLabel: job.procedure ? `${job.procedure.code} (${job.procedure.name})` : job.code,
      heater: heater ? { id: heater.id, assetTag: heater.assetTag, isActive: heater.isActive, lastCheck: heater.lastCheck } : null,
      coils: [coils.A, sideB].filter((c): c is TrenchCoil => c !== null).map((c) => ({ id: c.id, code: c.code, status: c.status, statusReason: c.statusReason, remainingM: c.remainingM, assignedJob: c.assignedJob ?? null })),
      // The recording crew, as the server takes it: the job's, or the fuser's on a job without a crew.
      job: { id: job.id, crewId: job.crewId ?? setup.user.crewId },
      on: today,
      admins: setup.admins,
      inspectors: setup.inspectors.length ? setup.inspectors : setup.admins,
    });
    const grants = setup.overrides.filter((o) => o.grantedById !== userId).map((o) => ({ id: o.id, jobId: o.jobId, subjectType: o.subjectType, subjectId: o.subjectId, grantedAt: new Date(o.grantedAt), expiresAt: new Date(o.expiresAt) }));
    return applyOverrides(reasons, grants, { jobId: job.id, madeAt: new Date(now || Date.parse(setup.loadedAt)) });
  }, [job, heater, coils.A, sideB, today, now, setup, userId]);

  // The same checks, in the same order, as the server's record-joint (domain/joints/pre-record.ts).
  const problems = preRecordProblems({ sideA: coils.A, sideB, machine }, system);
  const mismatch = problems.flatMap((p) => (p.kind === "size-mismatch" ? p.mismatches : []));
  const sameCoil = problems.find((p) => p.kind === "same-coil") ?? null;
  const odOutsideMachine = problems.some((p) => p.kind === "machine-size");
  const cannotRecord = blocks.open.length > 0 || problems.length > 0;

  return { blocks, mismatch, sameCoil, odOutsideMachine, cannotRecord };
}
