// Label layout maths (sheet sizes in mm) and label content.
import { describe, expect, it } from "vitest";
import { coilLabelText, coilLabelUrl, describeSize, jointLabelText, jointLabelUrl, qrPath, renderLabelSvg } from "@/domain/labels/label";
import { LABEL_STOCKS, SHEETS, findLabelStock, layoutSheet, placeLabels } from "@/domain/labels/sheets";

describe("label sheets", () => {
  it("uses the standard paper sizes", () => {
    // source: ISO 216 (A4 210 × 297 mm); ANSI/ASME Y14.1 (Letter 8.5 × 11 in) with 1 in = 25.4 mm (NIST SP 811)
    expect([SHEETS.a4.widthMm, SHEETS.a4.heightMm]).toEqual([210, 297]);
    expect(SHEETS.letter.widthMm).toBeCloseTo(215.9, 9);
    expect(SHEETS.letter.heightMm).toBeCloseTo(279.4, 9);
  });

  it.each([
    // common practice (no published source): office label sheets and the margins they are cut with
    ["a4-99x38", "a4", 2, 7, 4.65, 15.15],
    ["a4-70x37", "a4", 3, 8, 0, 0.5],
    ["a4-99x68", "a4", 2, 4, 4.65, 13.1],
    ["letter-4x2", "letter", 2, 5, 0.15625 * 25.4, 0.5 * 25.4],
    ["letter-2x1", "letter", 3, 10, 0.1875 * 25.4, 0.5 * 25.4],
    ["letter-4x3", "letter", 2, 3, 0.15625 * 25.4, 0.5 * 25.4],
  ] as const)("%s on %s: %i × %i, margins %f / %f mm", (stockId, sheetId, columns, rows, left, top) => {
    const layout = layoutSheet(SHEETS[sheetId], findLabelStock(stockId)!);
    expect([layout.columns, layout.rows, layout.perSheet]).toEqual([columns, rows, columns * rows]);
    expect(layout.marginLeftMm).toBeCloseTo(left, 6);
    expect(layout.marginTopMm).toBeCloseTo(top, 6);
  });

  it("every stock fits on both papers and stays on the sheet", () => {
    for (const stock of LABEL_STOCKS) {
      for (const sheet of [SHEETS.a4, SHEETS.letter]) {
        const layout = layoutSheet(sheet, stock);
        expect(layout.perSheet).toBeGreaterThan(0);
        const { slots } = placeLabels(layout, layout.perSheet);
        for (const s of slots) {
          expect(s.xMm).toBeGreaterThanOrEqual(-1e-9);
          expect(s.yMm).toBeGreaterThanOrEqual(-1e-9);
          expect(s.xMm + stock.widthMm).toBeLessThanOrEqual(sheet.widthMm + 1e-6);
          expect(s.yMm + stock.heightMm).toBeLessThanOrEqual(sheet.heightMm + 1e-6);
        }
      }
    }
  });

  it("skips used positions on the first sheet and starts new sheets when full", () => {
    const layout = layoutSheet(SHEETS.a4, findLabelStock("a4-99x38")!);
    const placed = placeLabels(layout, 15, 3);
    expect(placed.pages).toBe(2); // 3 used + 15 = 18 positions, 14 a sheet
    expect(placed.slots[0]).toMatchObject({ page: 0, row: 1, column: 1 });
    expect(placed.slots[11]).toMatchObject({ page: 1, row: 0, column: 0 });
    expect(placed.slots[0]!.xMm).toBeCloseTo(4.65 + 99.1 + 2.5, 6);
    expect(placed.slots[0]!.yMm).toBeCloseTo(15.15 + 38.1, 6);
  });
});

describe("label content", () => {
  const coil = { coilCode: "LV-C0001", series: "ips" as const, nominalSize: "1-1/4", sdr: 11, material: "PE4710", manufacturer: "Quillfield Polymers", lot: "4410021", lengthM: 152.4 };

  it("opens the coil's page and prints id, size/SDR, material, lot and length", () => {
    expect(coilLabelUrl("https://beadline.example/", "LV-C0001")).toBe("https://beadline.example/coils/LV-C0001");
    expect(describeSize(coil)).toBe('1 1/4" IPS SDR 11');
    // source: NIST SP 811, 152.4 m = 500 ft
    expect(coilLabelText(coil, "us").lines).toEqual(['1 1/4" IPS SDR 11', "PE4710", "Quillfield Polymers", "Lot 4410021", "Length 500 ft"]);
    expect(coilLabelText(coil, "si").lines.at(-1)).toBe("Length 152.4 m");
  });

  it("joint tags carry joint number, job and date, and open the joint page", () => {
    expect(jointLabelUrl("http://127.0.0.1:3000", 42)).toBe("http://127.0.0.1:3000/joints/42");
    expect(jointLabelText({ id: 42, jointNo: 7, jobCode: "WO-24117", jobName: "Fenwick Lane main renewal", madeOn: "2026-11-30" })).toEqual({
      title: "Joint 7",
      lines: ["WO-24117", "Fenwick Lane main renewal", "Made 2026-11-30"],
      name: "joint-WO-24117-7",
    });
  });

  it("draws one path run per horizontal run of dark modules and escapes text", () => {
    // 3 × 3 matrix: row 0 ■■□, row 1 □□□, row 2 ■□■
    expect(qrPath({ size: 3, data: [1, 1, 0, 0, 0, 0, 1, 0, 1] })).toBe("M0 0h2v1h-2zM0 2h1v1h-1zM2 2h1v1h-1z");
    const svg = renderLabelSvg({ widthMm: 99.1, heightMm: 38.1, qr: { size: 3, data: [1, 0, 1, 0, 1, 0, 1, 0, 1] }, text: { title: "A&B <1>", lines: ["x"], name: "n" }, url: "https://x/coils/A" });
    expect(svg).toContain('width="99.1mm" height="38.1mm" viewBox="0 0 99.1 38.1"');
    expect(svg).toContain("A&amp;B &lt;1&gt;");
    expect(svg).not.toContain("<1>");
  });
});
