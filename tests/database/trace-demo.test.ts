// Lot → ground over the full demo scenario (its joints are recorded through the Trench's
// insert functions with the coil pulls drawn down): for every lot, the trace gives exactly
// the joints a naive reference finds — a plain SELECT with OR over both coil columns — and
// each coil's length left equals its length less the pulls recorded against it.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/database/client";
import { traceLot } from "@/database/queries/trace";
import { closeOwnerDb, ownerDb, resetDatabase, seedDemo } from "../support/db";

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(new Date("2026-12-01T12:00:00Z"));
});

afterAll(async () => {
  await closeDb();
  await closeOwnerDb();
});

describe("lot → ground on the demo scenario", () => {
  it("matches the naive reference for every lot", async () => {
    const lots = (await ownerDb()("coils").distinct("manufacturer", "lot")) as { manufacturer: string; lot: string }[];
    expect(lots.length).toBeGreaterThan(1);
    let total = 0;
    for (const key of lots) {
      const [rows] = (await ownerDb().raw(
        `SELECT j.id FROM joints j LEFT JOIN coils a ON a.id = j.coil_a_id LEFT JOIN coils b ON b.id = j.coil_b_id
          WHERE (a.manufacturer = ? AND a.lot = ?) OR (b.manufacturer = ? AND b.lot = ?) ORDER BY j.id`,
        [key.manufacturer, key.lot, key.manufacturer, key.lot],
      )) as unknown as [{ id: number }[]];
      const trace = await traceLot(key);
      expect(trace.joints.map((j) => j.id).sort((x, y) => x - y)).toEqual(rows.map((r) => Number(r.id)));
      total += rows.length;
    }
    expect(total).toBeGreaterThan(0);
  });

  it("each coil's length left is its length less the pulls recorded on it, never negative", async () => {
    const [rows] = (await ownerDb().raw(
      `SELECT c.coil_code, c.length_m, c.remaining_m, c.status, COALESCE(SUM(e.pull_m), 0) AS pulled
         FROM coils c LEFT JOIN coil_events e ON e.coil_id = c.id GROUP BY c.id`,
    )) as unknown as [{ coil_code: string; length_m: number; remaining_m: number; status: string; pulled: number }[]];
    expect(rows.filter((r) => Number(r.pulled) > 0).length).toBeGreaterThan(0);
    for (const r of rows) {
      expect(Number(r.remaining_m)).toBeGreaterThanOrEqual(0);
      // The seed marks used-up coils at 0 without pulls; every other coil: left = length − pulls (to the cm).
      if (r.status !== "used-up" || Number(r.pulled) > 0) expect(Math.round(Number(r.remaining_m) * 100)).toBe(Math.round((Number(r.length_m) - Number(r.pulled)) * 100));
    }
  });
});
