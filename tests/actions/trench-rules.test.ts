// The Trench screen's pure rules (domain/joints) and its label scanning, table-driven:
// size mismatch between the two sides, refusals and blocking warnings, overrides, the
// phase timer, the made-at window, and a coil label QR decoded by ZXing (the decoder the
// browser uses) resolving to the coil. No database needed.
import QRCode from "qrcode";
import { BinaryBitmap, HybridBinarizer, QRCodeReader, RGBLuminanceSource } from "@zxing/library";
import { describe, expect, it } from "vitest";
import { findLocalCoil } from "@/app/(signed-in)/trench/_client/find-coil";
import type { TrenchCoil } from "@/app/_server/trench/setup-types";
import { planButtFusion } from "@/domain/fusion/plan";
import { applyOverrides, blockReasons, componentMismatch, crewPhrase, madeAtProblem, OVERRIDE_LOOKBACK_MS } from "@/domain/joints/rules";
import { recordJointFormSchema } from "@/domain/joints/schemas";
import { phaseLimits, phaseView, timedDurationS } from "@/domain/joints/timer";
import { qualificationStatus } from "@/domain/qualifications/status";
import { buildTraceCode } from "@/domain/trace-code/trace-code";

// IPS outside diameters: 2" = 2.375 in = 60.33 mm, 4" = 4.500 in = 114.3 mm
// source: ASME B36.10M / ASTM D2513 IPS sizes
const TWO_IN = 60.33;
const FOUR_IN = 114.3;

describe("componentMismatch (butt fusion joins same-size ends: ASTM F2620 §1 scope)", () => {
  const cases: [string, { od: number; sdr: number }, { od: number; sdr: number }, string[]][] = [
    ["same 2 in SDR 11", { od: TWO_IN, sdr: 11 }, { od: TWO_IN, sdr: 11 }, []],
    ["2 in vs 4 in", { od: TWO_IN, sdr: 11 }, { od: FOUR_IN, sdr: 11 }, ["outsideDiameter"]],
    ["SDR 11 vs SDR 13.5", { od: TWO_IN, sdr: 11 }, { od: TWO_IN, sdr: 13.5 }, ["sdr"]],
    ["both differ", { od: TWO_IN, sdr: 11 }, { od: FOUR_IN, sdr: 17 }, ["outsideDiameter", "sdr"]],
    ["rounding of the stored OD (0.01 mm) is not a mismatch", { od: 60.33, sdr: 11 }, { od: 60.32, sdr: 11 }, []],
  ];
  it.each(cases)("%s", (_name, a, b, fields) => {
    const out = componentMismatch({ label: "A", outsideDiameterMm: a.od, sdr: a.sdr }, { label: "B", outsideDiameterMm: b.od, sdr: b.sdr }, "us");
    expect(out.map((m) => m.field)).toEqual(fields);
    if (fields.includes("outsideDiameter")) expect(out[0]!.message).toContain("2.375 in"); // shown in the user's units
  });
});

describe("blockReasons", () => {
  const on = "2026-12-02";
  const qualified = qualificationStatus({ qualifiedOn: ["2026-10-01"], on });
  // 49 CFR 192.285(c): at most 15 months → a 2025-06-01 qualification ran out on 2026-09-01.
  const lapsed = qualificationStatus({ qualifiedOn: ["2025-06-01"], on });
  const heater = (lastCheck: { passed: boolean; nextDueOn: string } | null, isActive = true) => ({ id: 7, assetTag: "HP-7", isActive, lastCheck });
  const coil = (status: "in-use" | "quarantined" | "used-up") => ({ id: 3, code: "C-3", status, statusReason: status === "quarantined" ? "gouge" : null, remainingM: 10 });
  const base = { procedureLabel: "P-1", on, admins: ["Ada Admin"], inspectors: ["Ivy Inspector", "Ian Inspector"] };

  const cases: [string, Parameters<typeof blockReasons>[0], [string, string][]][] = [
    ["all clear", { ...base, qualification: qualified, heater: heater({ passed: true, nextDueOn: "2026-12-03" }), coils: [coil("in-use")] }, []],
    ["lapsed qualification refuses", { ...base, qualification: lapsed, heater: heater({ passed: true, nextDueOn: "2026-12-03" }), coils: [] }, [["qualification", "refuse"]]],
    // Check due the morning of its next-due day (office rule; PPI: check before the first joint of the day).
    ["heater check due today", { ...base, qualification: qualified, heater: heater({ passed: true, nextDueOn: on }), coils: [] }, [["heater-check-overdue", "override"]]],
    ["heater never checked", { ...base, qualification: qualified, heater: heater(null), coils: [] }, [["heater-check-overdue", "override"]]],
    ["heater failed its last check", { ...base, qualification: qualified, heater: heater({ passed: false, nextDueOn: "2026-12-03" }), coils: [] }, [["heater-check-failed", "override"]]],
    ["retired heater refuses", { ...base, qualification: qualified, heater: heater({ passed: true, nextDueOn: "2026-12-03" }, false), coils: [] }, [["heater-retired", "refuse"]]],
    ["quarantined coil", { ...base, qualification: qualified, heater: null, coils: [coil("quarantined")] }, [["coil-quarantined", "override"]]],
    ["used-up coil", { ...base, qualification: qualified, heater: null, coils: [coil("used-up")] }, [["coil-used-up", "override"]]],
  ];
  it.each(cases)("%s", (_name, input, expected) => {
    expect(blockReasons(input).map((r) => [r.kind, r.severity])).toEqual(expected);
  });

  it("says whom to ask", () => {
    const [refusal] = blockReasons({ ...base, qualification: lapsed, heater: null, coils: [] });
    expect(refusal!.message).toContain("Ask Ada Admin");
    expect(refusal!.message).toContain("ran out on 2026-09-01");
    const [block] = blockReasons({ ...base, qualification: qualified, heater: heater(null), coils: [] });
    expect(block!.message).toContain("Ivy Inspector or Ian Inspector");
  });

  it("an override covers its job and subject from 2 h before it was given until it expires; never a refusal", () => {
    const reasons = blockReasons({ ...base, qualification: lapsed, heater: heater(null), coils: [coil("quarantined")] });
    const grantedAt = new Date("2026-12-02T10:00:00Z");
    const grant = { id: 1, jobId: 5, subjectType: "heater" as const, subjectId: 7, grantedAt, expiresAt: new Date("2026-12-02T14:00:00Z") };
    const at = (iso: string, jobId = 5) => applyOverrides(reasons, [grant], { jobId, madeAt: new Date(iso) });
    expect(at("2026-12-02T11:00:00Z").covered.map((c) => c.reason.kind)).toEqual(["heater-check-overdue"]);
    expect(at("2026-12-02T11:00:00Z").open.map((r) => r.kind)).toEqual(["qualification", "coil-quarantined"]);
    expect(at(new Date(grantedAt.getTime() - OVERRIDE_LOOKBACK_MS).toISOString()).covered).toHaveLength(1);
    expect(at(new Date(grantedAt.getTime() - OVERRIDE_LOOKBACK_MS - 1000).toISOString()).covered).toHaveLength(0);
    expect(at("2026-12-02T14:00:01Z").covered).toHaveLength(0);
    expect(at("2026-12-02T11:00:00Z", 6).covered).toHaveLength(0);
  });
});

describe("a coil assigned to another crew's job (our rule: a coil belongs to the crew of its job; no published source)", () => {
  const on = "2026-12-02";
  const qualified = qualificationStatus({ qualifiedOn: ["2026-10-01"], on });
  const base = { procedureLabel: "P-1", on, admins: ["Ada Admin"], inspectors: ["Ivy Inspector"], qualification: qualified, heater: null };
  // The joint is recorded on job 5 by crew 1 (North crew); job 9 is crew 2's (River crew).
  const here = { id: 5, crewId: 1 };
  const riverJob = { id: 9, code: "WO-24152", name: "Orchard Rise service extension", crewId: 2, crewName: "River crew" };
  type AssignedJob = { id: number; code: string; name: string; crewId: number | null; crewName: string | null };
  const coil = (assignedJob: AssignedJob | null, status: "in-use" | "quarantined" = "in-use") => ({ id: 3, code: "LV-C0007", status, statusReason: null, remainingM: 40, assignedJob });
  const cases: [string, Parameters<typeof blockReasons>[0], [string, string][]][] = [
    ["on another crew's job: blocked until cleared", { ...base, job: here, coils: [coil(riverJob)] }, [["coil-other-crew", "override"]]],
    ["on this job", { ...base, job: here, coils: [coil({ ...riverJob, id: 5, crewId: 1 })] }, []],
    ["on another job of the same crew", { ...base, job: here, coils: [coil({ ...riverJob, crewId: 1, crewName: "North crew" })] }, []],
    ["on a job without a crew", { ...base, job: here, coils: [coil({ ...riverJob, crewId: null, crewName: null })] }, []],
    ["on no job", { ...base, job: here, coils: [coil(null)] }, []],
    ["a fuser without a crew on a crewless job, coil on a crew's job", { ...base, job: { id: 5, crewId: null }, coils: [coil(riverJob)] }, [["coil-other-crew", "override"]]],
    ["quarantined and on another crew's job: both", { ...base, job: here, coils: [coil(riverJob, "quarantined")] }, [["coil-quarantined", "override"], ["coil-other-crew", "override"]]],
    ["not judged without the recording job", { ...base, coils: [coil(riverJob)] }, []],
  ];
  it.each(cases)("%s", (_name, input, expected) => {
    expect(blockReasons(input).map((r) => [r.kind, r.severity])).toEqual(expected);
  });

  it("names the coil, the other job and its crew in words, and whom to ask", () => {
    const [block] = blockReasons({ ...base, job: here, coils: [coil(riverJob)] });
    expect(block!.message).toBe("Coil LV-C0007 is assigned to job WO-24152 (Orchard Rise service extension) of the River crew, not to this job. Use one of your crew's coils, or ask Ivy Inspector to clear it for this job before drawing it down.");
    expect(block!.subject).toEqual({ type: "coil", id: 3 });
  });

  it("an override for the coil on this job covers it", () => {
    const reasons = blockReasons({ ...base, job: here, coils: [coil(riverJob)] });
    const grant = { id: 4, jobId: 5, subjectType: "coil" as const, subjectId: 3, grantedAt: new Date("2026-12-02T10:00:00Z"), expiresAt: new Date("2026-12-02T14:00:00Z") };
    expect(applyOverrides(reasons, [grant], { jobId: 5, madeAt: new Date("2026-12-02T11:00:00Z") }).open).toEqual([]);
    expect(applyOverrides(reasons, [grant], { jobId: 6, madeAt: new Date("2026-12-02T11:00:00Z") }).open.map((r) => r.kind)).toEqual(["coil-other-crew"]);
  });

  it.each([
    ["River crew", "the River crew"],
    ["Ridge", "the Ridge crew"],
    [null, "another crew"],
  ])("crew %s in a sentence: %s", (name, phrase) => {
    expect(crewPhrase(name)).toBe(phrase);
  });
});

describe("phase timer (times stored as instants; common practice, no published source)", () => {
  // ASTM F2620 for 2" IPS SDR 11 (wall 0.216 in): changeover at most 8 s, cooling 11 min/in → 143 s
  // // from memory, unconfirmed (the procedure's values; their sources are in domain/procedures)
  const plan = planButtFusion({ standard: "astm-f2620", outsideDiameterMm: TWO_IN, sdr: 11, pistonAreaMm2: 1006.5, dragPressureMpa: 0.07 });
  const limits = phaseLimits(plan);
  const t0 = Date.parse("2026-12-02T09:00:00Z");
  const cases: [string, keyof typeof limits, number | null, number, string, number][] = [
    ["changeover running, under the maximum", "changeover", null, 5_400, "within", 5],
    ["changeover exactly at the maximum", "changeover", null, 8_000, "within", 8],
    ["changeover past the maximum", "changeover", null, 9_000, "over", 9],
    ["cooling short of the minimum", "cooling", null, 60_000, "under", 60],
    ["cooling at the minimum", "cooling", null, 143_000, "reached", 143],
    ["cooling ended after 150 s, viewed much later", "cooling", 150_400, 900_000, "reached", 150],
    ["heat soak with no limit in F2620", "heatSoak", null, 30_000, "none", 30],
  ];
  it.each(cases)("%s", (_n, phase, endOffset, nowOffset, tone, elapsed) => {
    const view = phaseView({ startedAt: t0, endedAt: endOffset === null ? null : t0 + endOffset }, limits[phase], t0 + nowOffset);
    expect(view.tone).toBe(tone);
    expect(view.elapsedS).toBe(elapsed);
  });
  it("fills a duration in whole seconds only once ended", () => {
    expect(timedDurationS({ startedAt: t0, endedAt: null })).toBeNull();
    expect(timedDurationS({ startedAt: t0, endedAt: t0 + 7_499 })).toBe(7);
    expect(timedDurationS({ startedAt: t0, endedAt: t0 + 7_500 })).toBe(8);
  });
});

describe("made-at window (our choice: 14 days late, 10 minutes of clock drift)", () => {
  const now = new Date("2026-12-02T12:00:00Z");
  it.each([
    ["now", "2026-12-02T12:00:00Z", null],
    ["9 minutes ahead", "2026-12-02T12:09:00Z", null],
    ["an hour ahead", "2026-12-02T13:00:00Z", "future"],
    ["13 days ago", "2026-11-19T12:00:00Z", null],
    ["15 days ago", "2026-11-17T12:00:00Z", "14 days"],
  ])("%s", (_n, iso, problem) => {
    const out = madeAtProblem(new Date(iso), now);
    if (problem === null) expect(out).toBeNull();
    else expect(out).toContain(problem);
  });
});

describe("the device form schema", () => {
  it("names every missing field at once, side B included", () => {
    const r = recordJointFormSchema.safeParse({ clientId: "8c7f3f5e-54a4-4a4e-9d5c-1d2f3a4b5c6d", kind: "coil-to-coil" });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["jobId", "coilA", "coilB", "heaterTemperatureC", "facingOk"]));
  });
  it("asks for the fitting on a fitting joint and refuses a length from a second coil", () => {
    const r = recordJointFormSchema.safeParse({ kind: "fitting", lengthBM: 3 });
    const byPath = Object.fromEntries(r.error!.issues.map((i) => [i.path.join("."), i.message]));
    expect(byPath.componentBText).toBe("Say which fitting is on side B.");
    expect(byPath.lengthBM).toMatch(/Only a coil-to-coil joint/);
  });
});

describe("coil label scanning", () => {
  // A 16-character ASTM F2897 code for the coil's lot: maker QF, lot 4410021, 2026-08-14,
  // PE4710 (Table 4 "H"), coiled pipe (Table 5 "12"), 2" IPS SDR 11 size factor 38 (Table 6).
  const trace = buildTraceCode({ manufacturer: "QF", lot: "4410021", productionDate: "2026-08-14", material: "PE4710", componentType: "12", sizeFactors: [38, 0] });
  const coils: TrenchCoil[] = [
    { id: 1, code: "LV-C0001", traceCode: null, manufacturer: "Quillfield Polymers", lot: "4410021", material: "PE4710", series: "ips", nominalSize: "2", outsideDiameterMm: TWO_IN, sdr: 11, remainingM: 152.4, status: "in-use", statusReason: null, crewId: null },
    { id: 2, code: "LV-C0002", traceCode: trace, manufacturer: "Quillfield Polymers", lot: "4410021", material: "PE4710", series: "ips", nominalSize: "2", outsideDiameterMm: TWO_IN, sdr: 11, remainingM: 152.4, status: "in-use", statusReason: null, crewId: null },
  ];

  async function decodeQr(text: string): Promise<string> {
    // Render the label's QR the way the label sheet does (qrcode), then read it back with ZXing.
    const qr = QRCode.create(text, { errorCorrectionLevel: "M" });
    const size = qr.modules.size;
    const scale = 6;
    const margin = 4 * scale;
    const width = size * scale + 2 * margin;
    const pixels = new Int32Array(width * width).fill(0xffffff);
    for (let y = 0; y < size; y += 1) {
      for (let x = 0; x < size; x += 1) {
        if (!qr.modules.get(y, x)) continue;
        for (let dy = 0; dy < scale; dy += 1) for (let dx = 0; dx < scale; dx += 1) pixels[(margin + y * scale + dy) * width + margin + x * scale + dx] = 0x000000;
      }
    }
    const bitmap = new BinaryBitmap(new HybridBinarizer(new RGBLuminanceSource(pixels, width, width)));
    return new QRCodeReader().decode(bitmap).getText();
  }

  it.each([
    ["the label's full address", "https://beadline.larkmoor-gas.example/coils/LV-C0001", 1],
    ["the label's path", "/coils/LV-C0002", 2],
    ["a bare coil id, any case", "lv-c0001", 1],
    ["the F2897 code on the pipe (case-sensitive)", "TRACE", 2],
    ["an unknown coil", "/coils/LV-C9999", null],
  ])("%s", async (_n, given, id) => {
    const text = given === "TRACE" ? trace : given;
    const decoded = await decodeQr(text);
    expect(decoded).toBe(text);
    expect(findLocalCoil(coils, decoded)?.id ?? null).toBe(id);
  });
});
