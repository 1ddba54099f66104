// Register queries against the real MariaDB: every filter and sort, paged by keyset with a
// small page size, gives exactly the rows of a naive reference (one plain SELECT of every
// joint, filtered and sorted in JavaScript) — none skipped, none repeated, ties included.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/database/client";
import { countRegister, findRegisterRowsByIds, iterateRegisterRows, listRegisterPage, seekCondition } from "@/database/queries/register";
import { decodeCursor, encodeCursor, registerPageQuerySchema, type RegisterFilter, type RegisterSort, type SortDirection } from "@/domain/register";
import { coilLabelUrl, jointLabelUrl } from "@/domain/labels/label";
import { buildRegisterJoints, type RegisterFixture } from "@/fixtures/register-joints";
import { moveJointMadeAt, ownerDb, resetDatabase } from "../support/db";

/** The zone of the reference filter below, whose days are UTC days (00:00Z to 24:00Z). */
const ZONE = "UTC";

type RefRow = {
  id: number;
  jobId: number;
  jobCode: string;
  jointNo: number;
  madeAt: number;
  fuserId: number;
  machineId: number;
  od: number;
  sdr: number;
  temp: number | null;
  findings: string[];
  outcome: string;
  review: string;
  lotA: string | null;
  lotB: string | null;
  codeA: string | null;
  codeB: string | null;
};

let fixture: RegisterFixture;
let all: RefRow[];

// The reference: a plain SELECT of every joint, no index tricks, no paging.
async function loadReference(): Promise<RefRow[]> {
  const [rows] = (await ownerDb().raw(`
    SELECT j.id, j.job_id, jb.code AS job_code, j.joint_no, j.made_at, j.fuser_id, j.machine_id, j.outside_diameter_mm, j.sdr,
           j.heater_temperature_c, j.finding_parameters, s.outcome, s.review_state,
           ca.lot AS lot_a, cb.lot AS lot_b, ca.coil_code AS code_a, cb.coil_code AS code_b
    FROM joints j JOIN joint_states s ON s.joint_id = j.id JOIN jobs jb ON jb.id = j.job_id
    LEFT JOIN coils ca ON ca.id = j.coil_a_id LEFT JOIN coils cb ON cb.id = j.coil_b_id`)) as unknown as [Record<string, unknown>[]];
  return rows.map((r) => ({
    id: Number(r.id),
    jobId: Number(r.job_id),
    jobCode: String(r.job_code),
    jointNo: Number(r.joint_no),
    madeAt: (r.made_at as Date).getTime(),
    fuserId: Number(r.fuser_id),
    machineId: Number(r.machine_id),
    od: Number(r.outside_diameter_mm),
    sdr: Number(r.sdr),
    temp: r.heater_temperature_c === null ? null : Number(r.heater_temperature_c),
    findings: r.finding_parameters ? String(r.finding_parameters).split(",") : [],
    outcome: String(r.outcome),
    review: String(r.review_state),
    lotA: (r.lot_a as string | null) ?? null,
    lotB: (r.lot_b as string | null) ?? null,
    codeA: (r.code_a as string | null) ?? null,
    codeB: (r.code_b as string | null) ?? null,
  }));
}

const byId = (id: number | undefined) => all.find((r) => r.id === id)!;
const jobCodeOf = (id: number | undefined) => byId(id).jobCode;
const jointNoOf = (id: number | undefined) => byId(id).jointNo;

const startsWithCi = (value: string | null, prefix: string) => value !== null && value.toLowerCase().startsWith(prefix.toLowerCase());

function referenceFilter(rows: RefRow[], f: RegisterFilter): RefRow[] {
  return rows.filter((r) => {
    if (f.job && r.jobId !== f.job) return false;
    if (f.fuser && r.fuserId !== f.fuser) return false;
    if (f.machine && r.machineId !== f.machine) return false;
    if (f.from && r.madeAt < Date.parse(`${f.from}T00:00:00Z`)) return false;
    if (f.to && r.madeAt >= Date.parse(`${f.to}T00:00:00Z`) + 86_400_000) return false;
    if (f.lot && r.lotA !== f.lot && r.lotB !== f.lot) return false;
    if (f.outcome && r.outcome !== f.outcome) return false;
    if (f.review && r.review !== f.review) return false;
    if (f.finding && !r.findings.includes(f.finding)) return false;
    if (f.q) {
      // common practice (no published source): search is a prefix match on coil id and
      // lot (case-insensitive, as the database collation compares), or an exact joint
      // number, alone ("12", "#12") or with its job code ("JOB joint 12", "JOB #12",
      // "JOB/12", "JOB 12", "JOB-12"); a joint tag's address (…/joints/<id>, the form
      // domain/labels jointLabelUrl prints) finds that joint alone, a coil label's address
      // (…/coils/<coil id>) searches that coil id.
      const q = f.q;
      const tag = /^https?:\/\/[^/]+\/joints\/(\d+)$/.exec(q);
      if (tag) return r.id === Number(tag[1]);
      const coil = /^https?:\/\/[^/]+\/coils\/([^/]+)$/.exec(q);
      const prefix = coil ? decodeURIComponent(coil[1]) : q;
      const m = /^(.+?)(?: joint |#| #|\/| |-)(\d{1,9})$/i.exec(q);
      const hit =
        startsWithCi(r.codeA, prefix) ||
        startsWithCi(r.codeB, prefix) ||
        startsWithCi(r.lotA, prefix) ||
        startsWithCi(r.lotB, prefix) ||
        (/^#?\d+$/.test(q) && r.jointNo === Number(q.replace("#", ""))) ||
        (m !== null && r.jobCode.toLowerCase() === m[1].toLowerCase() && r.jointNo === Number(m[2]));
      if (!hit) return false;
    }
    return true;
  });
}

// MariaDB's order: NULL sorts before every value ascending (and so after every value descending).
function cmp(a: number | null, b: number | null): number {
  if (a === b) return 0;
  if (a === null) return -1;
  if (b === null) return 1;
  return a < b ? -1 : 1;
}

function referenceSort(rows: RefRow[], sort: RegisterSort, dir: SortDirection): RefRow[] {
  const keys = (r: RefRow): (number | null)[] =>
    sort === "madeAt" ? [r.madeAt, r.id] : sort === "number" ? [r.jobId, r.jointNo, r.id] : sort === "pipeSize" ? [r.od, r.sdr, r.id] : [r.temp, r.id];
  const sign = dir === "asc" ? 1 : -1;
  return [...rows].sort((a, b) => {
    const ka = keys(a);
    const kb = keys(b);
    for (let i = 0; i < ka.length; i += 1) {
      const c = cmp(ka[i], kb[i]);
      if (c !== 0) return c * sign;
    }
    return 0;
  });
}

async function pageThrough(filter: RegisterFilter, sort: RegisterSort, dir: SortDirection, limit: number, timeZone = ZONE): Promise<{ ids: number[]; pages: number }> {
  const ids: number[] = [];
  let after;
  let pages = 0;
  for (;;) {
    const page = await listRegisterPage({ filter, timeZone, sort, dir, after, limit });
    pages += 1;
    ids.push(...page.rows.map((r) => r.id));
    if (!page.next) break;
    // The cursor makes the round trip through the URL as text, as the grid sends it.
    const decoded = decodeCursor(encodeCursor(page.next), { sort, dir });
    if (!decoded.ok) throw new Error(decoded.message);
    after = decoded.cursor;
    if (pages > 500) throw new Error("paging did not end");
  }
  return { ids, pages };
}

describe("register queries (keyset pages against a naive reference)", () => {
  beforeAll(async () => {
    await resetDatabase();
    fixture = await buildRegisterJoints(ownerDb(), { count: 2400, seed: 11 });
    all = await loadReference();
  }, 120_000);

  afterAll(async () => {
    await closeDb();
  });

  it("the fixture has the ties and the spread the checks need", () => {
    expect(all).toHaveLength(2400);
    const perInstant = new Map<number, number>();
    for (const r of all) perInstant.set(r.madeAt, (perInstant.get(r.madeAt) ?? 0) + 1);
    const tied = [...perInstant.values()].filter((n) => n > 1).length;
    expect(tied).toBeGreaterThan(100); // many joints share a made-at instant
    expect(all.some((r) => r.temp === null)).toBe(true); // NULLs in a sortable column
    expect(new Set(all.map((r) => r.review)).size).toBe(3);
  });

  const filters: [string, () => RegisterFilter][] = [
    ["no filter", () => ({})],
    ["job", () => ({ job: fixture.jobIds[2] })],
    ["date range", () => ({ from: "2026-09-15", to: "2026-10-20" })],
    ["single day", () => ({ from: "2026-10-01", to: "2026-10-01" })],
    ["fuser", () => ({ fuser: fixture.fuserIds[1] })],
    ["machine", () => ({ machine: fixture.machineIds[3] })],
    ["lot", () => ({ lot: fixture.lots[4] })],
    ["outcome out of limits", () => ({ outcome: "out-of-limits" })],
    ["review pending", () => ({ review: "pending-review" })],
    ["review cut out and outcome", () => ({ review: "cut-out", outcome: "out-of-limits" })],
    ["finding parameter", () => ({ finding: "cooling" })],
    ["finding with outcome", () => ({ finding: "bead", review: "accepted" })],
    ["search by coil id", () => ({ q: fixture.coilCodes[7] })],
    ["search by lot prefix, other case", () => ({ q: fixture.lots[0].slice(0, -1).toLowerCase() })],
    ["search by joint number", () => ({ q: "17" })],
    ["search by joint number with #", () => ({ q: "#17" })],
    ["search by joint as Beadline prints it", () => ({ q: `${jobCodeOf(fixture.jointIds[40])} joint ${jointNoOf(fixture.jointIds[40])}` })],
    ["search by job #number", () => ({ q: `${jobCodeOf(fixture.jointIds[41])} #${jointNoOf(fixture.jointIds[41])}` })],
    ["search by job/number", () => ({ q: `${jobCodeOf(fixture.jointIds[42])}/${jointNoOf(fixture.jointIds[42])}` })],
    ["search by job-number", () => ({ q: `${jobCodeOf(fixture.jointIds[43])}-${jointNoOf(fixture.jointIds[43])}` })],
    ["search by a joint tag's address", () => ({ q: jointLabelUrl("https://beadline.larkmoor-gas.example", fixture.jointIds[44]!) })],
    ["search by a coil label's address", () => ({ q: coilLabelUrl("https://beadline.larkmoor-gas.example", fixture.coilCodes[9]!) })],
    ["fuser and date and outcome", () => ({ fuser: fixture.fuserIds[0], from: "2026-08-20", outcome: "within-limits" })],
    ["job and lot and finding", () => ({ job: fixture.jobIds[0], lot: fixture.lots[1], finding: "heaterTemperature" })],
    ["machine and review and search", () => ({ machine: fixture.machineIds[0], review: "accepted", q: fixture.lots[3] })],
    ["unknown lot", () => ({ lot: "NO-SUCH-LOT" })],
  ];

  for (const [name, make] of filters) {
    it(`filter: ${name} — date-made order, newest first, pages of 37`, async () => {
      const filter = make();
      const expected = referenceSort(referenceFilter(all, filter), "madeAt", "desc").map((r) => r.id);
      const { ids } = await pageThrough(filter, "madeAt", "desc", 37);
      expect(new Set(ids).size).toBe(ids.length); // nothing repeated
      expect(ids).toEqual(expected); // nothing skipped, same order
      if (name !== "unknown lot") expect(expected.length).toBeGreaterThan(0);
    });
  }

  const sorts: [RegisterSort, SortDirection][] = [
    ["madeAt", "asc"],
    ["madeAt", "desc"],
    ["number", "asc"],
    ["number", "desc"],
    ["pipeSize", "asc"],
    ["pipeSize", "desc"],
    ["heaterTemperature", "asc"],
    ["heaterTemperature", "desc"],
  ];
  for (const [sort, dir] of sorts) {
    it(`sort: ${sort} ${dir} over the whole register and under a filter, pages of 113`, async () => {
      for (const filter of [{}, { outcome: "out-of-limits" as const }, { fuser: fixture.fuserIds[2], from: "2026-09-01" }, { lot: fixture.lots[6] }]) {
        const expected = referenceSort(referenceFilter(all, filter), sort, dir).map((r) => r.id);
        const { ids } = await pageThrough(filter, sort, dir, 113);
        expect(ids).toEqual(expected);
      }
    });
  }

  it("a page size of 1 walks a run of joints made at the same instant one by one", async () => {
    const perInstant = new Map<number, RefRow[]>();
    for (const r of all) perInstant.set(r.madeAt, [...(perInstant.get(r.madeAt) ?? []), r]);
    const [instant, tied] = [...perInstant.entries()].sort((a, b) => b[1].length - a[1].length)[0];
    expect(tied.length).toBeGreaterThan(4);
    const day = new Date(instant).toISOString().slice(0, 10);
    const filter = { from: day, to: day };
    const expected = referenceSort(referenceFilter(all, filter), "madeAt", "asc").map((r) => r.id);
    const { ids, pages } = await pageThrough(filter, "madeAt", "asc", 1);
    expect(ids).toEqual(expected);
    expect(pages).toBe(expected.length); // the last page is full and says there is no next page
  });

  it("rows carry the joined names and values the grid shows", async () => {
    const [first] = await findRegisterRowsByIds({ ids: [fixture.jointIds[5]] });
    const ref = all.find((r) => r.id === fixture.jointIds[5])!;
    expect(first.jointNo).toBe(ref.jointNo);
    expect(first.jobCode).toBe(ref.jobCode);
    expect(first.coilALot).toBe(ref.lotA);
    expect(first.reviewState).toBe(ref.review);
    expect(first.madeAt.getTime()).toBe(ref.madeAt);
    expect(first.findingParameters).toEqual(ref.findings);
    expect(typeof first.fuserName).toBe("string");
    expect(first.procedureCode).toMatch(/-BF-/);
  });

  it("the export's batches give the same rows as the pages, in order", async () => {
    const filter = { review: "accepted" as const };
    const expected = referenceSort(referenceFilter(all, filter), "number", "asc").map((r) => r.id);
    const ids: number[] = [];
    for await (const batch of iterateRegisterRows({ filter, timeZone: ZONE, sort: "number", dir: "asc", batchSize: 250 })) ids.push(...batch.map((r) => r.id));
    expect(ids).toEqual(expected);
  });

  it("counts exactly up to the cap and marks larger counts as not exact", async () => {
    const filter = { outcome: "out-of-limits" as const };
    const exact = referenceFilter(all, filter).length;
    expect(await countRegister({ filter, timeZone: ZONE })).toEqual({ value: exact, isExact: true, isEstimate: false, counting: false });
    expect(await countRegister({ filter: {}, timeZone: ZONE })).toEqual({ value: all.length, isExact: true, isEstimate: false, counting: false });
    const capped = await countRegister({ filter, timeZone: ZONE, cap: 50, background: false });
    expect(capped).toMatchObject({ isExact: false, isEstimate: true, counting: false });
    expect(capped.value).toBeGreaterThan(50);
    expect(await countRegister({ filter: { lot: "NO-SUCH-LOT" }, timeZone: ZONE })).toEqual({ value: 0, isExact: true, isEstimate: false, counting: false });
  });

  it("refuses a cursor made for another sort, and text that is no cursor", () => {
    const text = encodeCursor({ sort: "madeAt", dir: "desc", keys: [Date.parse("2026-10-01T00:00:00Z")], id: 5 });
    expect(decodeCursor(text, { sort: "madeAt", dir: "desc" }).ok).toBe(true);
    expect(decodeCursor(text, { sort: "number", dir: "desc" })).toMatchObject({ ok: false, message: expect.stringMatching(/another sort/) });
    expect(decodeCursor(text, { sort: "madeAt", dir: "asc" }).ok).toBe(false);
    expect(decodeCursor("not a cursor!", { sort: "madeAt", dir: "desc" }).ok).toBe(false);
    expect(decodeCursor("WzEsMl0", { sort: "madeAt", dir: "desc" }).ok).toBe(false);
  });

  it("writes the seek condition in its expanded form (no row-value comparison)", () => {
    const seek = seekCondition(
      [
        { expr: "j.made_at", nullable: false },
        { expr: "j.id", nullable: false },
      ],
      [new Date(0), 9],
      "desc",
    );
    // source: TOOLCHAIN.md "MariaDB 10.11 query facts" — (a, id) < (?, ?) is not a range scan
    expect(seek.text).toBe("(j.made_at < ? OR (j.made_at = ? AND j.id < ?))");
    expect(seek.text).not.toMatch(/\(j\.made_at, j\.id\)/);
    expect(seek.bindings).toHaveLength(3);
  });

  it("reads filter and sort from URL parameters with plain messages naming the field", () => {
    const ok = registerPageQuerySchema.safeParse({ job: "3", from: "2026-10-01", to: "", outcome: "out-of-limits", sort: "number", dir: "asc", limit: "50" });
    expect(ok.success && ok.data).toMatchObject({ job: 3, from: "2026-10-01", to: undefined, outcome: "out-of-limits", sort: "number", dir: "asc", limit: 50 });
    const bad = registerPageQuerySchema.safeParse({ from: "2026-02-30", to: "2026-01-01", outcome: "maybe", limit: "9000", fuser: "abc" });
    expect(bad.success).toBe(false);
    const fields = Object.fromEntries((bad.error?.issues ?? []).map((i) => [i.path.join("."), i.message]));
    expect(fields.from).toMatch(/not a real calendar date/);
    expect(fields.outcome).toMatch(/within limits or out of limits/);
    expect(fields.limit).toMatch(/page size/);
    expect(fields.fuser).toMatch(/fuser/);
    const reversed = registerPageQuerySchema.safeParse({ from: "2026-03-02", to: "2026-03-01" });
    expect(reversed.error?.issues[0]).toMatchObject({ path: ["to"], message: expect.stringMatching(/on or after the first day/) });
  });
});

// The day filter takes local days of the zone it is given (the organisation's). Each joint
// below sits at an instant chosen by hand around a local midnight or a daylight-saving
// change; whether it is inside the day is worked out from the IANA tz database's published
// offsets and DST dates, not from the code:
// - America/Chicago: CST −06:00, CDT −05:00; US DST (15 U.S.C. 260a) starts 2026-03-08 at
//   02:00 CST and ends 2026-11-01 at 02:00 CDT (07:00Z).
// - Europe/Berlin: CET +01:00, CEST +02:00; EU summer time (Directive 2000/84/EC) ends
//   2026-10-25 at 01:00Z.
describe("register day filter in the organisation's time zone (local days across DST)", () => {
  const CASES = [
    // zone, day, instant, inside the local day?, why
    ["America/Chicago", "2026-03-08", "2026-03-08T05:59:00Z", false, "23:59 CST on the 7th"],
    ["America/Chicago", "2026-03-08", "2026-03-08T06:00:00Z", true, "00:00 CST"],
    ["America/Chicago", "2026-03-08", "2026-03-08T08:00:00Z", true, "03:00 CDT, just after the change"],
    ["America/Chicago", "2026-03-08", "2026-03-09T04:59:00Z", true, "23:59 CDT"],
    ["America/Chicago", "2026-03-08", "2026-03-09T05:00:00Z", false, "00:00 CDT on the 9th (the 23-hour day has ended)"],
    ["America/Chicago", "2026-11-01", "2026-11-01T04:59:00Z", false, "23:59 CDT on 31 October"],
    ["America/Chicago", "2026-11-01", "2026-11-01T05:00:00Z", true, "00:00 CDT"],
    ["America/Chicago", "2026-11-01", "2026-11-01T06:30:00Z", true, "01:30 CDT, the first 01:30"],
    ["America/Chicago", "2026-11-01", "2026-11-01T07:30:00Z", true, "01:30 CST, the second 01:30"],
    ["America/Chicago", "2026-11-01", "2026-11-02T05:59:00Z", true, "23:59 CST (the 25th hour of the day)"],
    ["America/Chicago", "2026-11-01", "2026-11-02T06:00:00Z", false, "00:00 CST on 2 November"],
    ["Europe/Berlin", "2026-10-25", "2026-10-24T21:59:00Z", false, "23:59 CEST on the 24th"],
    ["Europe/Berlin", "2026-10-25", "2026-10-24T22:00:00Z", true, "00:00 CEST"],
    ["Europe/Berlin", "2026-10-25", "2026-10-25T22:59:00Z", true, "23:59 CET"],
    ["Europe/Berlin", "2026-10-25", "2026-10-25T23:00:00Z", false, "00:00 CET on the 26th"],
  ] as const;
  const placed = new Map<string, number>(); // instant → joint id

  beforeAll(async () => {
    await resetDatabase();
    // Joints made in June, far from every day below, then each moved to one chosen instant.
    await buildRegisterJoints(ownerDb(), { count: CASES.length, seed: 5, now: new Date("2026-06-30T12:00:00Z"), days: 5 });
    const ids = ((await ownerDb()("joints").orderBy("id").select("id")) as { id: number }[]).map((r) => Number(r.id));
    expect(ids).toHaveLength(CASES.length);
    for (const [i, c] of CASES.entries()) {
      await moveJointMadeAt(ids[i], c[2]);
      placed.set(c[2], ids[i]);
    }
  }, 120_000);

  afterAll(async () => {
    await closeDb();
  });

  const days = [...new Set(CASES.map((c) => `${c[0]} ${c[1]}`))];
  it.each(days)("filter: the local day %s (API order, count, and not the UTC day)", async (zoneDay) => {
    const [zone, day] = zoneDay.split(" ") as [string, string];
    const cases = CASES.filter((c) => c[0] === zone && c[1] === day);
    const inside = cases.filter((c) => c[3]).map((c) => placed.get(c[2])!);
    const page = await listRegisterPage({ filter: { from: day, to: day }, timeZone: zone, sort: "madeAt", dir: "asc", limit: 100, withCount: true });
    expect(page.rows.map((r) => r.id).sort()).toEqual([...inside].sort());
    expect(page.count).toEqual({ value: inside.length, isExact: true, isEstimate: false, counting: false });
    // The same day read as a UTC day takes other joints, so the check tells the two apart.
    const utc = await listRegisterPage({ filter: { from: day, to: day }, timeZone: "UTC", limit: 100 });
    expect(utc.rows.map((r) => r.id).sort()).not.toEqual([...inside].sort());
  });

  it("the states-table driver (a review filter) takes the same local day", async () => {
    const inside = CASES.filter((c) => c[0] === "America/Chicago" && c[1] === "2026-11-01" && c[3]).map((c) => placed.get(c[2])!);
    const review = String((await ownerDb()("joint_states").where({ joint_id: inside[0] }).first("review_state")).review_state) as "pending-review" | "accepted" | "cut-out";
    const states = await listRegisterPage({ filter: { from: "2026-11-01", to: "2026-11-01", review }, timeZone: "America/Chicago", limit: 100 });
    const same = (await ownerDb()("joint_states").whereIn("joint_id", inside).where({ review_state: review }).select("joint_id")) as { joint_id: number }[];
    expect(same.length).toBeGreaterThan(0);
    expect(states.rows.map((r) => r.id).sort()).toEqual(same.map((r) => Number(r.joint_id)).sort());
  });
});
