// The review queue over every waiting joint: keyset paging (the cursor is the last row's
// sort key, never an offset, so a joint decided while the inspector pages neither skips nor
// repeats a row), the default oldest-first order and the out-of-limits-first option across
// pages, the outcome/age/date filters and the counts beside each filter choice.
// The order rule is the product's own (oldest waiting joint first): common practice for a
// first-in first-out work queue, no published source.
import { beforeEach, describe, expect, it } from "vitest";
import { GET as queueGet } from "@/app/api/v1/review/queue/route";
import { decideJoint } from "@/app/_server/review/decide-joint";
import { findUserById } from "@/database/queries/users";
import { compareQueueItems, decodeQueueCursor, encodeQueueCursor } from "@/domain/review/queue";
import { makeReviewBase, makeReviewJoint, type MadeJoint, type ReviewBase } from "@/fixtures/review-joints";
import { requestAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

type Item = { jointId: number; outcome: "within-limits" | "out-of-limits"; madeAt: string };
type Body = { total: number; outOfLimits: number; next: string | null; items: Item[]; facets: Record<string, Record<string, number>> | null; error?: { fields?: Record<string, string[]> } };

async function queue(user: { id: number }, query = ""): Promise<{ status: number; body: Body }> {
  const response = await queueGet(await requestAs(user, `/api/v1/review/queue${query}`), { params: Promise.resolve({}) });
  return { status: response.status, body: (await response.json()) as Body };
}

/** Every page from the first, following `next`. */
async function allPages(user: { id: number }, query: string, between?: (page: number) => Promise<void>): Promise<{ pages: Body[]; ids: number[] }> {
  const pages: Body[] = [];
  let after: string | null = null;
  do {
    const sep = query ? "&" : "?";
    const { status, body } = await queue(user, `${query}${after ? `${sep}after=${encodeURIComponent(after)}` : ""}`);
    expect(status).toBe(200);
    pages.push(body);
    after = body.next;
    if (between) await between(pages.length);
  } while (after && pages.length < 20);
  return { pages, ids: pages.flatMap((p) => p.items.map((i) => i.jointId)) };
}

const HOUR = 3_600_000;

describe("review queue paging and filters", () => {
  let a: ReviewBase;
  let b: ReviewBase;
  let fuser: { id: number };
  let inspector: { id: number };
  let joints: MadeJoint[];
  let madeAt: Map<number, Date>;
  const start = new Date(Date.UTC(2026, 9, 1, 12));

  beforeEach(async () => {
    await resetDatabase();
    a = await makeReviewBase(ownerDb());
    b = await makeReviewBase(ownerDb());
    fuser = await makeUser({ roles: ["fuser"] });
    inspector = await makeUser({ roles: ["inspector"] });
    joints = [];
    madeAt = new Map();
    // 120 waiting joints; three share each hour (the id breaks the tie); every 7th out of limits.
    for (let i = 0; i < 120; i += 1) {
      const at = new Date(start.getTime() + Math.floor(i / 3) * 6 * HOUR);
      const j = await makeReviewJoint(ownerDb(), i % 2 ? a : b, { fuserId: fuser.id, madeAt: at, fault: i % 7 === 3 ? "cooling-short" : undefined });
      joints.push(j);
      madeAt.set(j.jointId, at);
    }
  }, 120_000);

  const expected = (order: "oldest" | "out-of-limits-first") =>
    [...joints].sort((x, y) => compareQueueItems({ outcome: x.check.outcome, madeAt: madeAt.get(x.jointId)!, jointId: x.jointId }, { outcome: y.check.outcome, madeAt: madeAt.get(y.jointId)!, jointId: y.jointId }, order)).map((j) => j.jointId);

  it("pages past the first 50, oldest first by default, every joint once", async () => {
    const first = await queue(inspector);
    expect(first.body.items).toHaveLength(50);
    expect(first.body.total).toBe(120);
    expect(first.body.next).not.toBeNull();
    const { pages, ids } = await allPages(inspector, "");
    expect(pages.map((p) => p.items.length)).toEqual([50, 50, 20]);
    expect(pages[2]!.next).toBeNull();
    expect(ids).toEqual(expected("oldest"));
    // By hand: the oldest joint is the first one made, and made-at never goes backwards.
    expect(ids[0]).toBe(joints[0]!.jointId);
    const times = pages.flatMap((p) => p.items.map((i) => Date.parse(i.madeAt)));
    expect(times.every((t, i) => i === 0 || t >= times[i - 1]!)).toBe(true);
  });

  it("pages the out-of-limits-first order across the change from out of limits to within limits", async () => {
    const { ids, pages } = await allPages(inspector, "?order=out-of-limits-first&limit=13");
    expect(ids).toEqual(expected("out-of-limits-first"));
    const outcomes = pages.flatMap((p) => p.items.map((i) => i.outcome));
    const lastOut = outcomes.lastIndexOf("out-of-limits");
    expect(outcomes.slice(0, lastOut + 1).every((o) => o === "out-of-limits")).toBe(true);
    expect(lastOut + 1).toBe(pages[0]!.outOfLimits);
  });

  it("a joint decided on an earlier page makes no later row skip or repeat (keyset, not offset)", async () => {
    const inspectorRecord = (await findUserById({ id: inspector.id }))!;
    const order = expected("oldest");
    const { ids } = await allPages(inspector, "?limit=40", async (page) => {
      // After the first page, two of its joints are accepted: an offset would now skip two rows.
      if (page === 1) {
        for (const jointId of order.slice(0, 2)) await decideJoint({ jointId, decision: "accepted", note: "", expectedRevisionNo: 1 }, { user: inspectorRecord, requestId: "t" });
      }
    });
    expect(ids).toEqual(order);
  });

  it("filters by outcome, age and the days made, and counts each filter choice", async () => {
    const out = await queue(inspector, "?outcome=out-of-limits&limit=200");
    const outIds = joints.filter((j) => j.check.outcome === "out-of-limits").map((j) => j.jointId);
    expect(out.body.items.map((i) => i.jointId).sort((x, y) => x - y)).toEqual([...outIds].sort((x, y) => x - y));
    expect(out.body.total).toBe(outIds.length);
    // Counts beside the choices: the other filters apply, the facet's own does not.
    expect(out.body.facets!.outcome).toEqual({ "out-of-limits": outIds.length, "within-limits": 120 - outIds.length });
    expect(out.body.facets!.job).toEqual({ [a.jobId]: joints.filter((j, i) => i % 2 && j.check.outcome === "out-of-limits").length, [b.jobId]: joints.filter((j, i) => !(i % 2) && j.check.outcome === "out-of-limits").length });
    expect(out.body.facets!.finding).toEqual({ cooling: outIds.length });

    // Made on 1 and 2 Oct 2026 (UTC noon + 6 h steps: 4 steps a day, 3 joints a step → 12 on 1 Oct from noon, then 12 on 2 Oct).
    const days = await queue(inspector, "?from=2026-10-01&to=2026-10-02&limit=200");
    const inDays = joints.filter((j) => madeAt.get(j.jointId)! < new Date(Date.UTC(2026, 9, 3))).map((j) => j.jointId);
    expect(days.body.items.map((i) => i.jointId)).toEqual(inDays);

    // Waiting more than N days: made before now − N × 24 h. Recent joints are left out.
    const recent = await makeReviewJoint(ownerDb(), a, { fuserId: fuser.id, madeAt: new Date(Date.now() - 2 * HOUR) });
    const old = await queue(inspector, "?waiting=1&limit=200");
    expect(old.body.total).toBe(120);
    expect(old.body.items.map((i) => i.jointId)).not.toContain(recent.jointId);
    expect((await queue(inspector)).body.total).toBe(121);

    const bad = await queue(inspector, "?outcome=maybe&waiting=0&from=2026-02-30&after=nonsense");
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error!.fields!).sort()).toEqual(["from", "outcome", "waiting"]);
    const badCursor = await queue(inspector, "?after=nonsense");
    expect(badCursor.status).toBe(422);
    expect(Object.keys(badCursor.body.error!.fields!)).toEqual(["after"]);
  });

  it("the cursor text round-trips and refuses what it did not write", () => {
    const c = { outcome: "within-limits" as const, madeAt: new Date("2026-12-01T08:00:00Z"), jointId: 37 };
    expect(decodeQueueCursor(encodeQueueCursor(c))).toEqual(c);
    for (const bad of ["", "x.1.2", "w.1", "w.-5.3", "w.1764576000000.0", "o.1764576000000.37; DROP"]) expect(decodeQueueCursor(bad)).toBeNull();
  });
});
