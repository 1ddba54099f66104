// The register's count: exact when cheap; above the cap "about N" first while the exact
// count runs in the background, then the exact count, equal to a plain SELECT COUNT(*);
// a joint added afterwards changes it. The cap is set low here (REGISTER_EXACT_COUNT_CAP).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as registerGet } from "@/app/api/v1/register/route";
import { closeDb } from "@/database/client";
import { countRegister, listRegisterPage, settleRegisterCounts } from "@/database/queries/register";
import { describeRegisterCount, roundEstimate, type RegisterCount } from "@/domain/register";
import { buildRegisterJoints } from "@/fixtures/register-joints";
import { ownerDb, resetDatabase, setOrganisationZoneRow } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser } from "../support/users";

const CAP = 50;
const ZONE = "UTC";
const noParams = { params: Promise.resolve({}) };
/** Every fixture joint lies in these days (fixture: 120 days before 2026-11-30). */
const YEAR = { from: "2026-01-01", to: "2026-12-31" };
let clerk: { id: number };

async function plainCount(): Promise<number> {
  const [rows] = (await ownerDb().raw(`SELECT COUNT(*) AS n FROM joints WHERE made_at >= '2026-01-01' AND made_at < '2027-01-01'`)) as unknown as [{ n: number }[]];
  return Number(rows[0].n);
}

async function apiCount(query: string): Promise<RegisterCount> {
  const res = await registerGet(await requestAs(clerk, `/api/v1/register?${query}`), noParams);
  expect(res.status).toBe(200);
  return ((await res.json()) as { count: RegisterCount }).count;
}

describe("register count words (pure)", () => {
  it("rounds an estimate to two significant figures (arithmetic rounding, common practice)", () => {
    expect(roundEstimate(857_184)).toBe(860_000);
    expect(roundEstimate(1_049_999)).toBe(1_000_000);
    expect(roundEstimate(12_345)).toBe(12_000);
    expect(roundEstimate(10_001)).toBe(10_000);
    expect(roundEstimate(64)).toBe(64);
  });

  it("never shows an estimate without 'about', nor its precise-looking figure", () => {
    for (const value of [51, 857_184, 10_001, 1_234_567]) {
      for (const counting of [true, false]) {
        const text = describeRegisterCount({ value, isExact: false, counting });
        expect(text).toMatch(/^About /);
        if (value >= 1000) expect(text).not.toContain(value.toLocaleString("en-US"));
      }
    }
    expect(describeRegisterCount({ value: 857_184, isExact: false, counting: true })).toBe("About 860,000 joints (counting exactly …)");
    expect(describeRegisterCount({ value: 857_184, isExact: true, counting: false })).toBe("857,184 joints");
    expect(describeRegisterCount({ value: 1, isExact: true, counting: false })).toBe("1 joint");
  });
});

describe("register count against MariaDB (cap set low)", () => {
  beforeAll(async () => {
    process.env.REGISTER_EXACT_COUNT_CAP = String(CAP);
    process.env.REGISTER_EXACT_COUNT_COOLDOWN_MS = "0";
    await resetDatabase();
    await buildRegisterJoints(ownerDb(), { count: 300, seed: 31 });
    await setOrganisationZoneRow(ZONE);
    clerk = await makeUser({ roles: ["clerk"], unitSystem: "si", name: "Clerk Maren Tolle" });
  }, 120_000);

  afterAll(async () => {
    delete process.env.REGISTER_EXACT_COUNT_CAP;
    delete process.env.REGISTER_EXACT_COUNT_COOLDOWN_MS;
    await settleRegisterCounts();
    await closeDb();
  });

  it("a small filter is counted exactly at once", async () => {
    const few = await countRegister({ filter: { from: "2026-11-29", to: "2026-11-30" }, timeZone: ZONE });
    expect(few.isExact).toBe(true);
    const [rows] = (await ownerDb().raw(`SELECT COUNT(*) AS n FROM joints WHERE made_at >= '2026-11-29' AND made_at < '2026-12-01'`)) as unknown as [{ n: number }[]];
    expect(few.value).toBe(Number(rows[0].n));
    expect(few.value).toBeLessThanOrEqual(CAP);
  });

  it("answers 'about' first, then the exact count equal to SELECT COUNT(*)", async () => {
    const expected = await plainCount();
    expect(expected).toBeGreaterThan(CAP);
    const first = await countRegister({ filter: YEAR, timeZone: ZONE });
    expect(first).toMatchObject({ isExact: false, isEstimate: true, counting: true });
    expect(first.value).toBeGreaterThan(CAP);
    expect(describeRegisterCount(first)).toMatch(/^About /);
    await settleRegisterCounts();
    const later = await countRegister({ filter: YEAR, timeZone: ZONE });
    expect(later).toEqual({ value: expected, isExact: true, isEstimate: false, counting: false });
    // The page's count reads the same cache.
    const page = await listRegisterPage({ filter: YEAR, timeZone: ZONE, limit: 5, withCount: true });
    expect(page.count).toEqual(later);
  });

  it("through the API: count=1 with the page, then count=only until exact; a joint added afterwards changes it", async () => {
    const query = `from=${YEAR.from}&to=${YEAR.to}&sort=number&dir=asc`;
    let count = await apiCount(`${query}&count=1&limit=5`);
    for (let i = 0; !count.isExact && i < 100; i += 1) {
      await new Promise((r) => setTimeout(r, 50));
      count = await apiCount(`${query}&count=only`);
    }
    const before = await plainCount();
    expect(count).toEqual({ value: before, isExact: true, isEstimate: false, counting: false });

    // One more joint in the same days: the cached exact count is not served again.
    await buildRegisterJoints(ownerDb(), { count: 1, seed: 32, prefix: "RC", days: 3 });
    const after = await plainCount();
    expect(after).toBe(before + 1);
    const fresh = await apiCount(`${query}&count=only`);
    // Until the new count is in, the last exact count is the "about" value, never the count.
    expect(fresh).toEqual({ value: before, isExact: false, isEstimate: true, counting: true });
    expect(describeRegisterCount(fresh)).toMatch(/^About /);
    await settleRegisterCounts();
    expect(await apiCount(`${query}&count=only`)).toEqual({ value: after, isExact: true, isEstimate: false, counting: false });
  });

  it("refuses a count parameter it does not know, naming it", async () => {
    const res = await registerGet(await requestAs(clerk, "/api/v1/register?count=maybe"), noParams);
    expect(res.status).toBe(422);
    expect(((await res.json()) as { error: { fields: Record<string, string[]> } }).error.fields.count[0]).toMatch(/count/);
  });
});
