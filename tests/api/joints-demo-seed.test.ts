// The demo joints seed (database/seeds/02-demo-joints.ts) on top of the demo scenario:
// about 30 joints over two weeks, gap-free numbers per job, verdicts that the joint check
// reproduces from the stored plan and values, a few out of limits, and one cut-out joint
// whose remake links back to it. Joint numbering and the cut-out/remake link follow
// Beadline's own rules (common practice, no published source); the check's windows are the
// procedure's (see tests/domain for their sources).
import { beforeAll, describe, expect, it } from "vitest";
import { checkJoint } from "@/domain/fusion/check";
import { jointMeasurements } from "@/domain/joints/values";
import { ownerDb, resetDatabase, seedDemo } from "../support/db";

const TODAY = new Date("2026-12-02T12:00:00Z");

describe("demo joints seed", () => {
  beforeAll(async () => {
    await resetDatabase();
    await seedDemo(TODAY);
  });

  it("loads about 30 joints on the two demo jobs with gap-free numbers matching the counters", async () => {
    const k = ownerDb();
    const jobs = await k("jobs").whereIn("code", ["WO-24117", "WO-24152"]).select("id", "code");
    let total = 0;
    for (const job of jobs) {
      const rows = await k("joints").where({ job_id: job.id }).orderBy("joint_no").select("joint_no");
      expect(rows.length).toBeGreaterThan(5);
      expect(rows.map((r) => r.joint_no)).toEqual(rows.map((_, i) => i + 1));
      const counter = await k("job_counters").where({ job_id: job.id }).first();
      expect(counter.last_joint_no).toBe(rows.length);
      total += rows.length;
    }
    expect(total).toBeGreaterThanOrEqual(25);
    expect(total).toBeLessThanOrEqual(35);
  });

  it("stores verdicts the joint check reproduces, some out of limits", async () => {
    const rows = await ownerDb()("joints").select("*");
    let out = 0;
    for (const r of rows) {
      const again = checkJoint(JSON.parse(r.plan), jointMeasurements({ heaterTemperatureC: r.heater_temperature_c, beadUpGaugePressureMpa: r.bead_up_gauge_mpa, fusionGaugePressureMpa: r.fusion_gauge_mpa, beadMm: r.bead_mm, heatSoakS: r.heat_soak_s, changeoverS: r.changeover_s, coolingS: r.cooling_s, facingOk: Boolean(r.facing_ok), alignmentOk: Boolean(r.alignment_ok), beadRollbackOk: Boolean(r.bead_rollback_ok), vGrooveOk: Boolean(r.v_groove_ok) }));
      expect(again.outcome).toBe(r.outcome);
      if (r.outcome === "out-of-limits") out += 1;
    }
    expect(out).toBeGreaterThanOrEqual(3);
    expect(out).toBeLessThan(rows.length / 2);
  });

  it("has one cut-out joint whose remake links to it, both ways", async () => {
    const k = ownerDb();
    const cut = await k("joint_states").where({ review_state: "cut-out" });
    expect(cut).toHaveLength(1);
    const remake = await k("joints").where({ replaces_joint_id: cut[0].joint_id }).first();
    expect(remake).toBeTruthy();
    expect(remake.outcome).toBe("within-limits");
    expect(cut[0].replaced_by_joint_id).toBe(remake.id);
    const revs = await k("joint_revisions").where({ joint_id: cut[0].joint_id }).orderBy("revision_no");
    expect(revs.map((r) => r.kind)).toEqual(["recorded", "cut-out"]);
  });

  it("drew the pulls off the coils", async () => {
    const k = ownerDb();
    const coil = await k("coils").where({ coil_code: "LV-C0001" }).first();
    const pulls = await k("coil_events").where({ coil_id: coil.id }).whereNotNull("joint_id").sum({ m: "pull_m" }).first();
    expect(Number(pulls?.m)).toBeGreaterThan(0);
    expect(Number(coil.remaining_m)).toBeCloseTo(152.4 - Number(pulls?.m), 2);
  });
});
