// Receipt integrity: a corrected ASTM F2897 code refills the fields the previous code
// filled; a coil that disagrees with its code saves only with a reason; a search by lot
// finds a coil by its typed lot or by the lot its code carries; messages name fields by
// their labels; the coil label prints the code and says quarantined in words; label paper.
import { describe, expect, it } from "vitest";
import { codeFillFrom, fieldsFromTraceCode, lotMatch, refillFromTraceCode } from "@/domain/coils/life";
import { RECEIVE_COIL_LABELS, receiveCoilSchema } from "@/domain/coils/schemas";
import { coilLabelText, renderLabelSvg } from "@/domain/labels/label";
import { labelPaperFor } from "@/domain/labels/sheets";
import { builtInProcedure } from "@/domain/procedures";
import { tightenFromForm } from "@/domain/procedures/form";
import { TIGHTEN_FORM_LABELS, tightenProcedureSchema } from "@/domain/procedures/schemas";
import { describeFieldErrors } from "@/domain/result";
import { parseTraceCode, traceCodeLotField } from "@/domain/trace-code/trace-code";

// Codes worked out by hand from the field layout of ASTM F2897-23a Table 1 (manufacturer 2,
// lot 4, date 3, material 1, component type 2, size 3, index 1 characters) and Table 2
// (base 62: 0–9 → 0–9, a–z → 10–35, A–Z → 36–61), not with the code under test:
//   lot 4430777 = 18·62³ + 36·62² + 40·62 + 9 → "i" "A" "E" "9" = "iAE9"
//   lot 4431234 = 18·62³ + 36·62² + 47·62 + 32 → "i" "A" "L" "w" = "iALw"
//   20 Oct 2026 = day 293 → DDDYY 29326 = 7·62² + 39·62 + 0 → "7D0"
//   Table 4: Z = PE100, H = PE4710; Table 5: 12 = coiled pipe
//   2" IPS SDR 11: Table 6 factor 38 → D = 38·378 + 38 + 1 = 14403 = 3·62² + 46·62 + 19 → "3Kj"
//   size "000" = no factor found (§5.7); index "0" = default.
const FIRST = "QFiAE97D0Z123Kj0"; // lot 4430777, PE100, 2" IPS SDR 11
const CORRECTED = "QFiALw7D0H123Kj0"; // lot 4431234, PE4710, 2" IPS SDR 11
const NO_SIZE = "QFiALw7D0H120000"; // lot 4431234, PE4710, no size factor

function fillOf(code: string, maker?: string) {
  const parsed = parseTraceCode(code);
  if (!parsed.ok) throw new Error(parsed.error);
  return codeFillFrom(fieldsFromTraceCode(parsed.value), maker);
}

describe("traceCodeLotField: the lot positions of a code, for a search by lot", () => {
  it.each([
    ["4430777", "iAE9"], // source: ASTM F2897-23a Tables 1, 2 (worked above)
    ["4431234", "iALw"], // source: ASTM F2897-23a Tables 1, 2 (worked above)
    ["0", "0000"], // source: ASTM F2897-23a Table 2 (zero, left-padded to the field's 4 characters)
  ])("lot %s → %s", (lot, field) => {
    expect(traceCodeLotField(lot)).toBe(field);
  });

  it.each(["12345678", "44A1234", "", "  "])("a lot a code cannot carry (%j) → null", (lot) => {
    // source: ASTM F2897-23a Table 1 (the lot is a number of at most 7 digits)
    expect(traceCodeLotField(lot)).toBeNull();
  });
});

describe("refillFromTraceCode: a corrected code refills what the previous code filled", () => {
  const defaults = { series: "ips", nominalSize: "2" };

  it("a first code fills the empty fields and says which", () => {
    const refill = refillFromTraceCode({ current: { series: "ips", nominalSize: "2" }, previousFill: {}, next: fillOf(FIRST, "Quillfield Polymers"), defaults });
    expect(refill.set).toMatchObject({ manufacturerCode: "QF", manufacturer: "Quillfield Polymers", lot: "4430777", productionDate: "2026-10-20", material: "PE100", sdr: "11" });
    expect(refill.filled).toEqual(["manufacturerCode", "manufacturer", "lot", "productionDate", "material", "sdr"]);
  });

  it("a corrected code moves lot and material with it; unchanged fields stay as they are", () => {
    const first = refillFromTraceCode({ current: { series: "ips", nominalSize: "2" }, previousFill: {}, next: fillOf(FIRST), defaults });
    const current = { series: "ips", nominalSize: "2", ...first.set };
    const corrected = refillFromTraceCode({ current, previousFill: first.fill, next: fillOf(CORRECTED), defaults });
    // source: ASTM F2897-23a Table 1 positions 3–6 and Table 4 (worked above)
    expect(corrected.set).toEqual({ lot: "4431234", material: "PE4710" });
    expect(corrected.filled).toEqual(["lot", "material"]);
    expect(corrected.kept).toEqual([]);
  });

  it("a field typed by hand is kept (and so shows as a disagreement), not overwritten", () => {
    const first = refillFromTraceCode({ current: { series: "ips", nominalSize: "2" }, previousFill: {}, next: fillOf(FIRST), defaults });
    const current = { series: "ips", nominalSize: "2", ...first.set, lot: "4430999" };
    const corrected = refillFromTraceCode({ current, previousFill: first.fill, next: fillOf(CORRECTED), defaults });
    expect(corrected.set.lot).toBeUndefined();
    expect(corrected.kept).toEqual(["lot"]);
    expect(corrected.filled).toEqual(["material"]);
  });

  it("what the previous code gave and the new one does not is emptied, so nothing of the old code stays", () => {
    const first = refillFromTraceCode({ current: { series: "ips", nominalSize: "2" }, previousFill: {}, next: fillOf(FIRST), defaults });
    const current = { series: "ips", nominalSize: "2", ...first.set };
    const noSize = refillFromTraceCode({ current, previousFill: first.fill, next: fillOf(NO_SIZE), defaults });
    // source: ASTM F2897-23a §5.7 ("000": no size factor, so the code gives no size)
    expect(noSize.cleared).toEqual(["series", "nominalSize", "sdr"]);
    expect(noSize.set).toMatchObject({ series: "ips", nominalSize: "2", sdr: "" });
  });
});

describe("lotMatch: how a coil answers a search by lot", () => {
  const coil = { lot: "4430777", traceCode: CORRECTED };
  it.each([
    ["4431234", "code-lot"], // the lot in its code (worked above)
    ["4430777", "typed-lot"],
    ["4429999", null],
  ] as const)("lot %s → %s", (lot, match) => {
    expect(lotMatch(coil, lot)).toBe(match);
  });
  it("both when they agree", () => {
    expect(lotMatch({ lot: "4431234", traceCode: CORRECTED }, "4431234")).toBe("both");
  });
});

describe("receiveCoilSchema: a coil that disagrees with its code saves only with a reason", () => {
  const form = {
    coilCode: "LV-C0900",
    manufacturer: "Quillfield Polymers",
    manufacturerCode: "QF",
    lot: "4430777",
    productionDate: "2026-10-20",
    material: "PE100",
    series: "ips",
    nominalSize: "2",
    sdr: "11",
    length: "152.4",
    traceCode: CORRECTED,
    endCapsInPlace: true,
  };

  it("refuses it without a reason, naming the fields by their labels", () => {
    const parsed = receiveCoilSchema.safeParse(form);
    expect(parsed.success).toBe(false);
    const issue = parsed.error!.issues.find((i) => i.path[0] === "disagreementReason")!;
    expect(issue.message).toBe("The code disagrees with Lot, Material designation: correct the fields or the code, or say why the coil is saved as it is.");
  });

  it("accepts it with a reason", () => {
    expect(receiveCoilSchema.safeParse({ ...form, disagreementReason: "Print line reads lot 4430777; the maker's tag is being checked" }).success).toBe(true);
  });

  it("needs no reason when the fields agree with the code", () => {
    expect(receiveCoilSchema.safeParse({ ...form, lot: "4431234", material: "PE4710" }).success).toBe(true);
  });
});

describe("messages name fields as the person sees them, never by internal name", () => {
  it("a field without a label is not named; its own message says which", () => {
    const message = describeFieldErrors({ manufacturerCode: ["Manufacturer id in the code is 2 letters or digits."] });
    expect(message).toBe("Check this field: Manufacturer id in the code is 2 letters or digits.");
    expect(message).not.toContain("manufacturerCode");
  });

  it("fields with labels are named by them", () => {
    expect(describeFieldErrors({ lot: ["Enter the lot."], sdr: ["SDR must be a number."] }, RECEIVE_COIL_LABELS)).toBe("Check Lot, SDR (DR): Enter the lot. SDR must be a number.");
  });

  it("the Procedures tighten form names the heater window by its label", () => {
    const input = tightenProcedureSchema.parse({ units: "si", procedureId: "1", basedOnVersionId: "1", note: "Tighter heater window", heaterMin: "150" });
    // source: ASTM F2620-20 heater surface 400–450 °F (204–232 °C): a minimum of 150 °C loosens it
    const outcome = tightenFromForm(builtInProcedure("astm-f2620"), input, { procedureCode: "LVG-BF-01", versionNo: 2 });
    expect(outcome.ok).toBe(false);
    const message = describeFieldErrors((outcome as { fields: Record<string, string[]> }).fields, TIGHTEN_FORM_LABELS);
    expect(message).toMatch(/^Check Heater temperature minimum: /);
    expect(message).not.toMatch(/heaterMin|heaterTemperatureC/);
  });
});

describe("coil labels: the F2897 code in text, quarantine in words, paper by locale", () => {
  const coil = { coilCode: "LV-C0900", series: "ips" as const, nominalSize: "2", sdr: 11, material: "PE4710", manufacturer: "Quillfield Polymers", lot: "4431234", lengthM: 152.4, traceCode: CORRECTED };

  it("prints the code as text, in a monospaced face", () => {
    const text = coilLabelText({ ...coil, status: "in-yard" });
    expect(text.lines).toContain(`F2897 ${CORRECTED}`);
    expect(text.warningLine).toBeUndefined();
    const svg = renderLabelSvg({ widthMm: 99.1, heightMm: 38.1, qr: { size: 1, data: [1] }, text, url: "https://x/coils/LV-C0900" });
    expect(svg).toMatch(new RegExp(`font-family="DejaVu Sans Mono[^"]*"[^>]*>F2897 ${CORRECTED}<`));
  });

  it("a quarantined coil's label says so first, in words (white on black, not colour alone)", () => {
    const text = coilLabelText({ ...coil, status: "quarantined" });
    expect(text.lines[0]).toBe("QUARANTINED: DO NOT USE");
    const svg = renderLabelSvg({ widthMm: 99.1, heightMm: 38.1, qr: { size: 1, data: [1] }, text, url: "https://x/coils/LV-C0900" });
    expect(svg).toMatch(/font-weight="700" fill="#fff">QUARANTINED: DO NOT USE</);
    expect(svg).toContain('aria-label="LV-C0900: QUARANTINED: DO NOT USE');
  });

  it.each([
    ["us", "letter"], // source: ANSI/ASME Y14.1 "A" size (US Letter), the US office paper
    ["si", "a4"], // source: ISO 216 A4, the paper used nearly everywhere else
  ] as const)("unit system %s → %s paper", (unitSystem, paper) => {
    expect(labelPaperFor({ unitSystem })).toBe(paper);
  });
});
