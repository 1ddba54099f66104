// Coil life rules: pulls (never negative, a pull longer than what is left refused with a
// clear message), the next-run warning, the receipt inspection, the F2897 cross-check,
// status moves, scanned text, stations on the run schematic.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  fieldsFromTraceCode,
  judgeReceiptInspection,
  nextCoilCode,
  nextRunWarning,
  planPull,
  readScannedCoilText,
  statusMoveProblem,
  traceCodeDisagreements,
} from "@/domain/coils/life";
import { layoutRun, parseStation } from "@/domain/coils/schematic";
import { moveCoilSchema, receiveCoilSchema, traceSearchSchema } from "@/domain/coils/schemas";
import { parseTraceCode } from "@/domain/trace-code/trace-code";

// A code worked out by hand from ASTM F2897-23a §§3–5, not with the code under test:
// "QF" manufacturer; lot 4410021 → base 62 (Table 2: 0–9, a–z, A–Z) = 18·62³ + 31·62² + 15·62 + 23 → "ivfn";
// 14 Aug 2026 = day 226 → DDDYY 22626 = 5·62² + 54·62 + 58 → "5SW" (Table 1);
// material H = PE4710 (Table 4); component 12 = coiled pipe (Table 5);
// 2" IPS SDR 11 factor 38 (Table 6) → D = 38·378 + 38 + 1 = 14403 (§5.7) = 3·62² + 46·62 + 19 → "3Kj"; index "0".
const CODE_2IN_SDR11 = "QFivfn5SWH123Kj0";

describe("planPull: the length left after a pull at the trench", () => {
  const coil = { coilCode: "LV-C0001", status: "in-use" as const, remainingM: 152.4 };

  it.each([
    // common practice (no published source): left = remaining − pull, to the centimetre
    [20, 132.4, "in-use"],
    [0.01, 152.39, "in-use"],
    [152.4, 0, "used-up"],
  ] as const)("pulling %s m from 152.4 m leaves %s m (%s)", (pull, left, status) => {
    const plan = planPull(coil, pull);
    expect(plan).toEqual({ ok: true, remainingM: left, status, isUsedUp: status === "used-up" });
  });

  it("refuses a pull longer than what is left, naming the coil and both lengths", () => {
    // common practice (no published source): the record must not claim pipe the coil did not have
    const plan = planPull(coil, 152.41);
    expect(plan.ok).toBe(false);
    if (!plan.ok) {
      expect(plan.reason).toBe("too-long");
      expect(plan.message).toBe("LV-C0001 has only 152.40 m left; the pull of 152.41 m is longer");
    }
  });

  it("states the lengths in feet for a US crew", () => {
    // source: NIST SP 811, 1 ft = 0.3048 m exactly → 30.48 m = 100.0 ft, 40 m = 131.2 ft
    const plan = planPull({ ...coil, remainingM: 30.48 }, 40, "us");
    expect(plan.ok === false && plan.message).toBe("LV-C0001 has only 100.0 ft left; the pull of 131.2 ft is longer");
  });

  it.each([
    [0, "not-positive"],
    [-3, "not-positive"],
    [Number.NaN, "not-a-number"],
  ] as const)("refuses a pull of %s (%s)", (pull, reason) => {
    const plan = planPull(coil, pull);
    expect(plan.ok === false && plan.reason).toBe(reason);
  });

  it("refuses pulls from a quarantined or used-up coil", () => {
    // common practice (no published source): quarantined pipe must not be laid
    const q = planPull({ ...coil, status: "quarantined", statusReason: "Lot recalled" }, 1);
    expect(q.ok === false && q.message).toBe("LV-C0001 is quarantined (Lot recalled); pipe from it must not be laid");
    const u = planPull({ ...coil, status: "used-up", remainingM: 0 }, 1);
    expect(u.ok === false && u.reason).toBe("used-up");
  });

  it("never gives a negative length and never loses or invents a centimetre (property)", () => {
    // common practice (no published source): left = remaining − pull in whole cm, or refused
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 300_000 }), fc.integer({ min: -1000, max: 300_000 }), (remainingCm, pullCm) => {
        const plan = planPull({ coilCode: "C", status: "in-use", remainingM: remainingCm / 100 }, pullCm / 100);
        if (plan.ok) {
          expect(plan.remainingM).toBeGreaterThanOrEqual(0);
          expect(Math.round(plan.remainingM * 100)).toBe(remainingCm - pullCm);
        } else {
          expect(pullCm <= 0 || pullCm > remainingCm || remainingCm === 0).toBe(true);
        }
      }),
      { numRuns: 500 },
    );
  });
});

describe("nextRunWarning", () => {
  it("warns when the next run is longer than what is left, with the shortfall", () => {
    // common practice (no published source): 150 m run − 120.5 m left = 29.5 m from another coil
    expect(nextRunWarning({ coilCode: "LV-C0002", remainingM: 120.5 }, 150)).toBe(
      "The next run of 150.0 m is longer than the 120.5 m left on LV-C0002: 29.5 m must come from another coil, with a joint between them",
    );
  });
  it("is silent when the run fits exactly or no run is given", () => {
    expect(nextRunWarning({ coilCode: "C", remainingM: 120.5 }, 120.5)).toBeNull();
    expect(nextRunWarning({ coilCode: "C", remainingM: 120.5 }, null)).toBeNull();
  });
});

describe("judgeReceiptInspection", () => {
  // 2" IPS SDR 11: OD 2.375 in = 60.325 mm (ASME B36.10), minimum wall OD/SDR = 5.484 mm (ASTM D3035).
  const base = { outsideDiameterMm: 60.325, sdr: 11, damageKinds: [], gougeDepthMm: null, gougeLimitPct: 10, ovalityPct: 2, ovalityLimitPct: 5, endCapsInPlace: true } as const;

  it("passes a clean coil", () => {
    expect(judgeReceiptInspection(base)).toEqual({ passed: true, reasons: [] });
  });
  it("fails a gouge deeper than 10 % of the wall (0.55 mm) and passes one of 0.50 mm", () => {
    // from memory, unconfirmed: 10 % of wall as the operator's gouge limit; wall OD/SDR (ASTM D3035)
    expect(judgeReceiptInspection({ ...base, damageKinds: ["gouge"], gougeDepthMm: 0.5 }).passed).toBe(true);
    const failed = judgeReceiptInspection({ ...base, damageKinds: ["gouge"], gougeDepthMm: 0.6 });
    expect(failed.passed).toBe(false);
    expect(failed.reasons[0]).toBe("Gouge 0.60 mm deep is deeper than the limit of 0.55 mm (10 % of the 5.48 mm minimum wall)");
  });
  it("fails kinks, flattening, ovality over the limit and missing end caps, each with a reason", () => {
    // from memory, unconfirmed: coiled-pipe ovality limit about 5 % (ASTM D2513)
    const result = judgeReceiptInspection({ ...base, damageKinds: ["kink", "flattening"], ovalityPct: 6.2, endCapsInPlace: false });
    expect(result.passed).toBe(false);
    expect(result.reasons).toEqual(["Kinked or buckled pipe", "Flattened pipe", "Ovality at the end 6.2 % is above the 5 % limit", "End caps missing: the bore may be contaminated"]);
  });
  it("does not release a coil with gouges reported but not measured", () => {
    expect(judgeReceiptInspection({ ...base, damageKinds: ["gouge"] }).passed).toBe(false);
  });
});

describe("F2897 code → receipt fields, and disagreements", () => {
  it("the hand-built code parses (helper check) and fills every field it encodes", () => {
    const parsed = parseTraceCode(CODE_2IN_SDR11);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    // source: ASTM F2897-23a Tables 1, 4, 6 — see the working beside CODE_2IN_SDR11
    const fields = fieldsFromTraceCode(parsed.value);
    expect(fields).toEqual({
      manufacturerCode: "QF",
      lot: "4410021",
      productionDate: "2026-08-14",
      material: "PE4710",
      series: "ips",
      nominalSize: "2",
      sdr: 11,
      outsideDiameterMm: expect.any(Number),
    });
    expect(fields.outsideDiameterMm).toBeCloseTo(60.325, 9); // source: ASME B36.10 IPS OD, 2.375 in × 25.4
  });

  it("finds no disagreement with matching typed fields", () => {
    expect(traceCodeDisagreements(CODE_2IN_SDR11, { manufacturerCode: "QF", lot: "4410021", productionDate: "2026-08-14", material: "PE4710", series: "ips", nominalSize: "2", sdr: 11 })).toEqual([]);
  });

  it("flags each typed field that disagrees with the code", () => {
    // source: ASTM F2897-23a Table 6 — factor 38 is 2" IPS SDR 11, while 4" SDR 11 is 44
    const flags = traceCodeDisagreements(CODE_2IN_SDR11, { manufacturerCode: "QF", lot: "4410388", productionDate: "2026-08-14", material: "PE2708", series: "ips", nominalSize: "4", sdr: 11 });
    expect(flags.map((f) => f.field)).toEqual(["lot", "material", "nominalSize"]);
    expect(flags[0]!.message).toBe("The code carries lot 4410021, the form says 4410388");
    expect(flags[2]!.message).toBe('The code says 2" IPS SDR 11, the form says 4" IPS SDR 11');
  });

  it("flags a code for a fitting rather than pipe", () => {
    // source: ASTM F2897-23a Table 5 — 61 is a butt-fusion tee
    const tee = `${CODE_2IN_SDR11.slice(0, 10)}61${CODE_2IN_SDR11.slice(12)}`;
    expect(traceCodeDisagreements(tee, {}).map((f) => f.field)).toEqual(["traceCode"]);
  });
});

describe("status moves", () => {
  it.each([
    // our rules (common practice, no published source), on top of domain/coils
    [{ from: "in-yard", to: "on-trailer", crewId: 1 }, null],
    [{ from: "in-yard", to: "on-trailer" }, "crewId"],
    [{ from: "on-trailer", to: "in-use", jobId: 2 }, null],
    [{ from: "on-trailer", to: "in-use" }, "jobId"],
    [{ from: "in-yard", to: "used-up" }, "to"],
    [{ from: "in-use", to: "quarantined" }, "reason"],
    [{ from: "used-up", to: "quarantined", reason: "Lot recall 2026-11" }, null],
    [{ from: "quarantined", to: "in-yard" }, "reason"],
  ] as const)("%o → problem on %s", (move, field) => {
    expect(statusMoveProblem(move)?.field ?? null).toBe(field);
  });
});

describe("scanned text and coil ids", () => {
  it.each([
    ["http://127.0.0.1:3000/coils/LV-C0001", { kind: "coil-code", code: "LV-C0001" }],
    ["https://beadline.example/coils/LV%2DC0002?x=1", { kind: "coil-code", code: "LV-C0002" }],
    ["  LV-C0003 ", { kind: "coil-code", code: "LV-C0003" }],
    ["", { kind: "empty" }],
  ] as const)("%s", (text, expected) => {
    expect(readScannedCoilText(text)).toEqual(expected);
  });
  it("reads a 16-character F2897 code as a code", () => {
    expect(readScannedCoilText(CODE_2IN_SDR11).kind).toBe("trace-code");
  });
  it.each([
    ["LV-C0012", "LV-C0013"],
    ["LV-C0999", "LV-C1000"],
    [null, "C-0001"],
  ])("next coil id after %s is %s", (last, next) => {
    expect(nextCoilCode(last)).toBe(next);
  });
});

describe("schemas", () => {
  const valid = { coilCode: "LV-C0100", manufacturer: "Quillfield Polymers", lot: "4410021", material: "PE4710", series: "ips", nominalSize: "2", sdr: "11", length: "500", lengthUnit: "ft", endCapsInPlace: true };

  it("turns a coil typed in feet into metres and fills the OD from the size", () => {
    const parsed = receiveCoilSchema.parse(valid);
    // source: NIST SP 811, 500 ft × 0.3048 = 152.4 m; ASME B36.10, 2" IPS OD 2.375 in = 60.325 mm
    expect(parsed.lengthM).toBe(152.4);
    expect(parsed.outsideDiameterMm).toBeCloseTo(60.325, 6);
    expect(parsed.gougeLimitPct).toBe(10);
  });

  it("names every failing field", () => {
    const result = receiveCoilSchema.safeParse({ ...valid, coilCode: "", lot: "", sdr: "abc", length: "-1", traceCode: "TOO-SHORT" });
    expect(result.success).toBe(false);
    const paths = result.success ? [] : result.error.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["coilCode", "lot", "sdr", "length", "traceCode"]));
  });

  it("refuses a size that is not in the series", () => {
    const result = receiveCoilSchema.safeParse({ ...valid, nominalSize: "7" });
    expect(result.success ? [] : result.error.issues.map((i) => i.path.join("."))).toEqual(["nominalSize"]);
  });

  it("needs a lot or a code to trace, and a move needs its status", () => {
    expect(traceSearchSchema.safeParse({}).success).toBe(false);
    expect(traceSearchSchema.safeParse({ manufacturer: "Quillfield Polymers" }).success).toBe(false);
    expect(traceSearchSchema.safeParse({ code: "LV-C0001" }).success).toBe(true);
    expect(moveCoilSchema.safeParse({ coilId: 1, version: 1, to: "lost" }).success).toBe(false);
  });
});

describe("run schematic", () => {
  it.each([
    // common practice (no published source): US stations of 100 ft; metric chainage km+m; ft = 0.3048 m (NIST SP 811)
    ["12+50", 381],
    ["STA 0+00", 0],
    ["3+25.5", 99.21],
    ["1+250.5", 1250.5],
    ["0+125", 125],
    ["north side", null],
  ])("station %s is %s m from station 0", (text, metres) => {
    const parsed = parseStation(text);
    if (metres === null) expect(parsed).toBeNull();
    else expect(parsed!.metres).toBeCloseTo(metres, 2);
  });

  it("places joints by station when all have one, else by coordinates, else by joint number", () => {
    const byStation = layoutRun([
      { id: 1, jointNo: 1, station: "0+00", latitude: null, longitude: null },
      { id: 2, jointNo: 2, station: "5+00", latitude: null, longitude: null },
      { id: 3, jointNo: 3, station: "10+00", latitude: null, longitude: null },
    ]);
    expect(byStation.basis).toBe("station");
    expect(byStation.points.map((p) => p.t)).toEqual([0, 0.5, 1]);
    expect(byStation.lengthM).toBeCloseTo(304.8, 6); // 1,000 ft
    // 0.001° of latitude ≈ 111.2 m (mean Earth radius 6,371 km, IUGG): three points due north
    const byCoords = layoutRun([
      { id: 1, jointNo: 1, station: null, latitude: 41.2, longitude: -77.19 },
      { id: 2, jointNo: 2, station: null, latitude: 41.2005, longitude: -77.19 },
      { id: 3, jointNo: 3, station: null, latitude: 41.201, longitude: -77.19 },
    ]);
    expect(byCoords.basis).toBe("coordinates");
    expect(byCoords.lengthM).toBeCloseTo(111.19, 1);
    expect(byCoords.points[1]!.t).toBeCloseTo(0.5, 6);
    const byNumber = layoutRun([
      { id: 1, jointNo: 4, station: "somewhere", latitude: null, longitude: null },
      { id: 2, jointNo: 8, station: null, latitude: null, longitude: null },
    ]);
    expect(byNumber.basis).toBe("joint-number");
    expect(byNumber.points.map((p) => p.t)).toEqual([0, 1]);
  });
});
