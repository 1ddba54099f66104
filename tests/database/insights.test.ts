// The numbers behind the Insights charts against direct SQL over the same tables (written
// independently: plain WHERE/COUNT per group instead of the query module's CASE sums,
// FIND_IN_SET over the comma list instead of JSON_TABLE over the findings), and against the
// counts known from the fixture joints themselves.
import { beforeAll, describe, expect, it } from "vitest";
import { coolingRecordedVersusRequired, findingsByParameter, firstPassYieldByFuser, firstPassYieldByMachine, firstPassYieldByWeek, heaterTemperatures, insightsSummary } from "@/database/queries/insights";
import { JOINT_PARAMETERS } from "@/domain/fusion/parameters";
import { makeReviewBase, makeReviewJoint, type FaultName, type MadeJoint } from "@/fixtures/review-joints";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

const FROM = new Date("2026-10-05T00:00:00Z"); // a Monday
const TO = new Date("2026-11-16T00:00:00Z");
const filter = { from: FROM, to: TO };

type Made = MadeJoint & { fuserId: number; machineId: number; madeAt: Date; cutOut: boolean };

describe("insights queries", () => {
  const made: Made[] = [];

  beforeAll(async () => {
    await resetDatabase();
    const k = ownerDb();
    const a = await makeReviewBase(k);
    const b = await makeReviewBase(k);
    const f1 = await makeUser({ roles: ["fuser"], name: "Fuser One" });
    const f2 = await makeUser({ roles: ["fuser"], name: "Fuser Two" });
    const faults: (FaultName | null)[] = [null, "cooling-short", null, "heater-cold", null, null, "changeover-long", null, "cooling-short", null, "bead-small", null, null, "pressure-high", null, null, "heater-cold", null];
    for (let i = 0; i < faults.length; i += 1) {
      const base = i % 3 === 0 ? b : a;
      const fuserId = i % 2 === 0 ? f1.id : f2.id;
      // Two to three joints a day, spread over six weeks (one lands outside the period).
      const madeAt = new Date(FROM.getTime() + i * 2.4 * 86_400_000 + 7 * 3_600_000);
      const joint = await makeReviewJoint(k, base, { fuserId, madeAt, fault: faults[i] ?? undefined });
      made.push({ ...joint, fuserId, machineId: base.machineId, madeAt, cutOut: false });
    }
    // An outside-the-period joint that must not be counted.
    await makeReviewJoint(k, a, { fuserId: f1.id, madeAt: new Date(TO.getTime() + 3_600_000), fault: "cooling-short" });
    // Two out-of-limits joints cut out, one within-limits joint cut out (seen on a later inspection).
    for (const j of [made[1]!, made[3]!, made[4]!]) {
      await k("joint_states").where({ joint_id: j.jointId }).update({ review_state: "cut-out", revision_no: 2 });
      j.cutOut = true;
    }
  });

  const inPeriod = () => made.filter((m) => m.madeAt >= FROM && m.madeAt < TO);
  const isFirstPass = (m: Made) => m.check.outcome === "within-limits" && !m.cutOut;

  it("first-pass yield by week matches direct SQL and the fixtures", async () => {
    const rows = await firstPassYieldByWeek(filter);
    const [direct] = (await ownerDb().raw(
      `SELECT YEARWEEK(j.made_at, 3) AS wk, MIN(DATE(j.made_at)) AS first_day, COUNT(*) AS n,
              (SELECT COUNT(*) FROM joints j2 JOIN joint_states s2 ON s2.joint_id = j2.id
                WHERE YEARWEEK(j2.made_at, 3) = YEARWEEK(j.made_at, 3) AND j2.made_at >= ? AND j2.made_at < ?
                  AND s2.outcome = 'within-limits' AND s2.review_state <> 'cut-out') AS ok
         FROM joints j WHERE j.made_at >= ? AND j.made_at < ? GROUP BY YEARWEEK(j.made_at, 3) ORDER BY wk`,
      [FROM, TO, FROM, TO],
    )) as [{ wk: number; n: number; ok: number }[]];
    expect(rows.map((r) => [r.joints, r.firstPass])).toEqual(direct.map((d) => [Number(d.n), Number(d.ok)]));
    // Monday starts (ISO 8601 weeks): every weekStart is a Monday, six weeks from 2026-10-05.
    expect(rows.map((r) => new Date(`${r.weekStart}T00:00:00Z`).getUTCDay())).toEqual(rows.map(() => 1));
    expect(rows[0]!.weekStart).toBe("2026-10-05");
    const total = rows.reduce((s, r) => s + r.joints, 0);
    expect(total).toBe(inPeriod().length);
    expect(rows.reduce((s, r) => s + r.firstPass, 0)).toBe(inPeriod().filter(isFirstPass).length);
    for (const r of rows) expect(r.yieldPct).toBeCloseTo((100 * r.firstPass) / r.joints, 1);
  });

  it("first-pass yield by fuser and by machine match direct SQL", async () => {
    for (const [fn, column] of [
      [firstPassYieldByFuser, "fuser_id"],
      [firstPassYieldByMachine, "machine_id"],
    ] as const) {
      const rows = await fn(filter);
      for (const r of rows) {
        const n = await ownerDb()("joints").where(column, r.id).where("made_at", ">=", FROM).where("made_at", "<", TO).count({ n: "*" }).first();
        const ok = await ownerDb()("joints as j")
          .join("joint_states as s", "s.joint_id", "j.id")
          .where(`j.${column}`, r.id)
          .where("j.made_at", ">=", FROM)
          .where("j.made_at", "<", TO)
          .where("s.outcome", "within-limits")
          .whereNot("s.review_state", "cut-out")
          .count({ n: "*" })
          .first();
        expect([r.joints, r.firstPass]).toEqual([Number(n!.n), Number(ok!.n)]);
        const key = column === "fuser_id" ? "fuserId" : "machineId";
        expect(r.joints).toBe(inPeriod().filter((m) => m[key] === r.id).length);
      }
      expect(rows.reduce((s, r) => s + r.joints, 0)).toBe(inPeriod().length);
    }
  });

  it("findings by parameter match FIND_IN_SET counts over the comma list", async () => {
    const rows = await findingsByParameter(filter);
    for (const parameter of JOINT_PARAMETERS) {
      const n = await ownerDb()("joints").whereRaw("FIND_IN_SET(?, finding_parameters) > 0", [parameter]).where("made_at", ">=", FROM).where("made_at", "<", TO).count({ n: "*" }).first();
      expect(rows.find((r) => r.parameter === parameter)?.joints ?? 0).toBe(Number(n!.n));
      expect(Number(n!.n)).toBe(inPeriod().filter((m) => m.check.findings.some((f) => f.parameter === parameter)).length);
    }
    expect(rows.find((r) => r.parameter === "cooling")?.joints).toBe(2);
  });

  it("heater temperatures come with each plan's window; cooling with each plan's minimum", async () => {
    const heat = await heaterTemperatures(filter);
    expect(heat).toHaveLength(inPeriod().length);
    for (const p of heat) {
      const m = made.find((x) => x.jointId === p.jointId)!;
      expect(p.heaterTemperatureC).toBe(m.values.heaterTemperatureC);
      expect(p.minC).toBeCloseTo(m.plan.heaterTemperatureC.min, 6);
      expect(p.maxC).toBeCloseTo(m.plan.heaterTemperatureC.max, 6);
    }
    expect(heat.map((p) => p.madeAt.getTime())).toEqual([...heat.map((p) => p.madeAt.getTime())].sort((x, y) => x - y));
    const cooling = await coolingRecordedVersusRequired(filter);
    const [direct] = (await ownerDb().raw(
      "SELECT id, cooling_s, JSON_EXTRACT(plan, '$.minCoolingS') AS req FROM joints WHERE made_at >= ? AND made_at < ? AND cooling_s IS NOT NULL ORDER BY made_at, id",
      [FROM, TO],
    )) as [{ id: number; cooling_s: number; req: string }[]];
    expect(cooling.map((c) => [c.jointId, c.coolingS, c.minCoolingS])).toEqual(direct.map((d) => [Number(d.id), Number(d.cooling_s), Number(d.req)]));
    expect(cooling.filter((c) => c.coolingS < c.minCoolingS)).toHaveLength(2);
  });

  it("the summary adds up", async () => {
    const s = await insightsSummary(filter);
    expect(s.joints).toBe(inPeriod().length);
    expect(s.firstPass).toBe(inPeriod().filter(isFirstPass).length);
    expect(s.outOfLimits).toBe(inPeriod().filter((m) => m.check.outcome === "out-of-limits").length);
    expect(s.cutOut).toBe(3);
    expect(s.pending).toBe(inPeriod().length - 3);
  });
});
