// The review queue API: who may read it, its "out of limits first" order (then oldest —
// domain/review/queue.ts compareQueueItems), its filters, and what each item carries.
// Paging, the default oldest-first order and the newer filters: review-queue-paging.test.ts.
import { beforeEach, describe, expect, it } from "vitest";
import { GET as queueGet } from "@/app/api/v1/review/queue/route";
import { GET as jointGet } from "@/app/api/v1/review/joints/[id]/route";
import { compareQueueItems } from "@/domain/review/queue";
import { makeReviewBase, makeReviewJoint, type ReviewBase } from "@/fixtures/review-joints";
import { requestAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

type Item = { jointId: number; outcome: "within-limits" | "out-of-limits"; madeAt: string; jobId: number; fuserId: number; machineId: number; findings: { parameter: string; message: string }[]; comparison: { key: string; status: string; planText: string; recordedText: string }[]; photos: { url: string }[]; revisionNo: number };

async function queue(user: { id: number } | null, query = "") {
  const response = await queueGet(await requestAs(user, `/api/v1/review/queue${query}`), { params: Promise.resolve({}) });
  return { status: response.status, body: (await response.json()) as { total: number; outOfLimits: number; items: Item[]; error?: { code: string; fields?: Record<string, string[]> } } };
}

const day = (d: number, h = 8) => new Date(Date.UTC(2026, 10, d, h));

describe("review queue API", () => {
  let a: ReviewBase;
  let b: ReviewBase;
  let f1: { id: number };
  let f2: { id: number };
  let inspector: { id: number };

  beforeEach(async () => {
    await resetDatabase();
    a = await makeReviewBase(ownerDb());
    b = await makeReviewBase(ownerDb());
    f1 = await makeUser({ roles: ["fuser"] });
    f2 = await makeUser({ roles: ["fuser"] });
    inspector = await makeUser({ roles: ["inspector"], unitSystem: "us" });
  });

  it("is for inspectors only", async () => {
    expect((await queue(null)).status).toBe(401);
    expect((await queue(await makeUser({ roles: ["fuser"] }))).status).toBe(403);
    expect((await queue(await makeUser({ roles: ["clerk"] }))).status).toBe(403);
    expect((await queue(await makeUser({ roles: ["admin"] }))).status).toBe(403);
    expect((await queue(inspector)).status).toBe(200);
  });

  it("lists out-of-limits joints first, then the oldest; decided joints leave it", async () => {
    const j = [
      await makeReviewJoint(ownerDb(), a, { fuserId: f1.id, madeAt: day(3) }),
      await makeReviewJoint(ownerDb(), a, { fuserId: f1.id, madeAt: day(5), fault: "cooling-short" }),
      await makeReviewJoint(ownerDb(), b, { fuserId: f2.id, madeAt: day(1) }),
      await makeReviewJoint(ownerDb(), b, { fuserId: f2.id, madeAt: day(4), fault: "heater-cold" }),
      await makeReviewJoint(ownerDb(), a, { fuserId: f2.id, madeAt: day(2), fault: "bead-small" }),
      await makeReviewJoint(ownerDb(), a, { fuserId: f1.id, madeAt: day(6) }),
    ];
    await ownerDb()("joint_states").where({ joint_id: j[5]!.jointId }).update({ review_state: "accepted", revision_no: 2 });
    const { body } = await queue(inspector, "?order=out-of-limits-first");
    expect(body.total).toBe(5);
    expect(body.outOfLimits).toBe(3);
    // Order checked against the domain rule, and by hand: out of limits by age (2, 4, 5 Nov), then within (1, 3 Nov).
    const sorted = [...body.items].sort((x, y) => compareQueueItems({ ...x, madeAt: new Date(x.madeAt) }, { ...y, madeAt: new Date(y.madeAt) }, "out-of-limits-first"));
    expect(body.items.map((i) => i.jointId)).toEqual(sorted.map((i) => i.jointId));
    expect(body.items.map((i) => i.jointId)).toEqual([j[4]!, j[3]!, j[1]!, j[2]!, j[0]!].map((x) => x.jointId));
    // A page smaller than the queue keeps the order and the full counts.
    const page = await queue(inspector, "?order=out-of-limits-first&limit=2");
    expect(page.body.items.map((i) => i.jointId)).toEqual([j[4]!.jointId, j[3]!.jointId]);
    expect(page.body.total).toBe(5);
  });

  it("filters by job, fuser, machine and finding, and names a bad filter", async () => {
    const j1 = await makeReviewJoint(ownerDb(), a, { fuserId: f1.id, madeAt: day(1), fault: "cooling-short" });
    const j2 = await makeReviewJoint(ownerDb(), b, { fuserId: f2.id, madeAt: day(2), fault: "heater-cold" });
    const j3 = await makeReviewJoint(ownerDb(), a, { fuserId: f2.id, madeAt: day(3) });
    const ids = async (q: string) => (await queue(inspector, q)).body.items.map((i) => i.jointId).sort();
    expect(await ids(`?job=${a.jobId}`)).toEqual([j1.jointId, j3.jointId].sort());
    expect(await ids(`?fuser=${f2.id}`)).toEqual([j2.jointId, j3.jointId].sort());
    expect(await ids(`?machine=${b.machineId}`)).toEqual([j2.jointId]);
    expect(await ids("?finding=cooling")).toEqual([j1.jointId]);
    expect(await ids(`?finding=heaterTemperature&fuser=${f1.id}`)).toEqual([]);
    expect(await ids("?job=&finding=")).toHaveLength(3);
    const bad = await queue(inspector, "?finding=colour&machine=abc");
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error!.fields!).sort()).toEqual(["finding", "machine"]);
  });

  it("gives each item its findings in the inspector's units and plan next to recorded values", async () => {
    const joint = await makeReviewJoint(ownerDb(), a, { fuserId: f1.id, madeAt: day(1), fault: "heater-cold" });
    const { body } = await queue(inspector);
    const item = body.items[0]!;
    // 204.4–232.2 °C is 400–450 °F (ASTM F2620 heater window, °F = °C × 9/5 + 32, NIST SP 811).
    expect(item.findings.map((f) => f.message)).toEqual([`Heater temperature ${Math.round((joint.values.heaterTemperatureC! * 9) / 5 + 32)} °F is below the 400–450 °F window`]);
    const heater = item.comparison.find((c) => c.key === "heaterTemperature")!;
    expect(heater).toMatchObject({ status: "finding", planText: "400–450 °F" });
    expect(item.comparison.find((c) => c.key === "cooling")).toMatchObject({ status: "ok" });
    await ownerDb()("attachments").insert({ kind: "bead-photo", object_key: `photo-${joint.jointId}`, content_type: "image/jpeg", size_bytes: 10, sha256: "0".repeat(64), joint_id: joint.jointId, original_name: "bead.jpg" });
    const detail = await jointGet(await requestAs(inspector, `/api/v1/review/joints/${joint.jointId}`), { params: Promise.resolve({ id: String(joint.jointId) }) });
    const json = (await detail.json()) as { item: Item; revisions: { kind: string }[] };
    expect(json.item.photos.map((p) => p.url)).toEqual([expect.stringMatching(/^\/api\/v1\/attachments\/\d+$/)]);
    expect(json.revisions.map((r) => r.kind)).toEqual(["recorded"]);
  });
});
