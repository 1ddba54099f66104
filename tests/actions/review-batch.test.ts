// Batch accept of joints within limits: each joint through the single decision (its own
// revision, audit entry, optimistic lock, transaction); out-of-limits joints and the
// inspector's own joints are refused by the server whatever is sent; the answer lists what
// was skipped and why; the batch size is bounded. Rules: Beadline's own — "nobody reviews a
// joint they made themselves" (common practice for separation of duties in QA, no
// published source) and "an out-of-limits joint is decided on its own, with a note".
import { beforeEach, describe, expect, it } from "vitest";
import { acceptBatchAction } from "@/app/(signed-in)/review/actions";
import { POST as batchPost } from "@/app/api/v1/review/batch-accept/route";
import { MAX_BATCH_ACCEPT } from "@/domain/review/schemas";
import { makeReviewBase, makeReviewJoint, type ReviewBase } from "@/fixtures/review-joints";
import { actAs, requestAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

const MADE = new Date("2026-11-20T09:30:00Z");
const state = (jointId: number) => ownerDb()("joint_states").where({ joint_id: jointId }).first();

describe("batch accept", () => {
  let base: ReviewBase;
  let other: ReviewBase;
  let fuser: { id: number };
  let inspector: { id: number };

  beforeEach(async () => {
    await resetDatabase();
    base = await makeReviewBase(ownerDb());
    other = await makeReviewBase(ownerDb());
    fuser = await makeUser({ roles: ["fuser"] });
    inspector = await makeUser({ roles: ["fuser", "inspector"] });
  });

  it("accepts the ticked joints within limits, each with its own revision and audit entry, and says why the others were skipped", async () => {
    const good = [];
    for (let i = 0; i < 3; i += 1) good.push(await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE }));
    const out = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE, fault: "heater-cold" });
    const own = await makeReviewJoint(ownerDb(), base, { fuserId: inspector.id, madeAt: MADE });
    const moved = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    const decided = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    // Moved on since the inspector loaded the queue: a second revision (as a pressure trace upload writes one).
    await ownerDb()("joint_revisions").insert({ joint_id: moved.jointId, revision_no: 2, kind: "trace-attached", by_user_id: fuser.id, at: MADE, review_state: "pending-review" });
    await ownerDb()("joint_states").where({ joint_id: moved.jointId }).update({ revision_no: 2 });
    await ownerDb()("joint_states").where({ joint_id: decided.jointId }).update({ review_state: "cut-out", revision_no: 2 });

    await actAs(inspector);
    const sent = [...good, out, own, moved, decided].map((j) => ({ jointId: j.jointId, expectedRevisionNo: 1 }));
    const r = await acceptBatchAction({ note: "Checked on the daily walk", joints: sent });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.data.accepted.map((x) => x.jointId)).toEqual(good.map((g) => g.jointId));
    expect(Object.fromEntries(r.data.skipped.map((s) => [s.jointId, s.reason]))).toEqual({
      [out.jointId]: "out-of-limits",
      [own.jointId]: "own-joint",
      [moved.jointId]: "changed",
      [decided.jointId]: "already-decided",
    });
    expect(r.data.skipped.find((s) => s.jointId === out.jointId)!.label).toBe(`${base.jobCode} joint ${out.jointNo}`);
    expect(r.data.message).toMatch(/^3 joints accepted\. 4 skipped: /);
    for (const g of good) {
      expect(await state(g.jointId)).toMatchObject({ review_state: "accepted", revision_no: 2 });
      const revs = await ownerDb()("joint_revisions").where({ joint_id: g.jointId }).orderBy("revision_no");
      expect(revs.map((x) => [x.revision_no, x.kind, x.reason, x.by_user_id])).toEqual([
        [1, "recorded", null, fuser.id],
        [2, "accepted", "Checked on the daily walk", inspector.id],
      ]);
      expect(await ownerDb()("audit_log").where({ action: "joint-accepted", entity_id: String(g.jointId) })).toHaveLength(1);
    }
    // Nothing written for the skipped ones.
    expect(await state(out.jointId)).toMatchObject({ review_state: "pending-review", revision_no: 1 });
    expect(await state(own.jointId)).toMatchObject({ review_state: "pending-review", revision_no: 1 });
    expect(await state(moved.jointId)).toMatchObject({ review_state: "pending-review", revision_no: 2 });
    expect(await ownerDb()("audit_log").whereIn("entity_id", [out, own, moved, decided].map((j) => String(j.jointId))).where({ action: "joint-accepted" })).toHaveLength(0);
  });

  it("accepts all within limits matching a filter, resolved on the server: out-of-limits ones are left out and counted", async () => {
    const mine = [await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE }), await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE })];
    const out = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE, fault: "bead-small" });
    const own = await makeReviewJoint(ownerDb(), base, { fuserId: inspector.id, madeAt: MADE });
    const elsewhere = await makeReviewJoint(ownerDb(), other, { fuserId: fuser.id, madeAt: MADE });
    const response = await batchPost(await requestAs(inspector, "/api/v1/review/batch-accept", { method: "POST", json: { note: "", matching: { job: String(base.jobId) } } }), { params: Promise.resolve({}) });
    expect(response.status).toBe(200);
    const body = (await response.json()) as { accepted: { jointId: number }[]; skipped: { jointId: number; reason: string }[]; outOfLimitsLeftOut: number };
    expect(body.accepted.map((x) => x.jointId)).toEqual(mine.map((m) => m.jointId));
    expect(body.skipped).toMatchObject([{ jointId: own.jointId, reason: "own-joint" }]);
    expect(body.outOfLimitsLeftOut).toBe(1);
    expect(await state(out.jointId)).toMatchObject({ review_state: "pending-review" });
    expect(await state(elsewhere.jointId)).toMatchObject({ review_state: "pending-review" });
    // Filtering on out of limits gives nothing to accept.
    const none = await batchPost(await requestAs(inspector, "/api/v1/review/batch-accept", { method: "POST", json: { matching: { outcome: "out-of-limits" } } }), { params: Promise.resolve({}) });
    expect(((await none.json()) as { accepted: unknown[] }).accepted).toEqual([]);
    expect(await state(out.jointId)).toMatchObject({ review_state: "pending-review" });
  });

  it("bounds the batch: too many ticked or matching joints are refused whole with a clear message", async () => {
    await actAs(inspector);
    const tooMany = Array.from({ length: MAX_BATCH_ACCEPT + 1 }, (_, i) => ({ jointId: i + 1, expectedRevisionNo: 1 }));
    const r = await acceptBatchAction({ note: "", joints: tooMany });
    expect(r).toMatchObject({ ok: false, status: 422 });
    if (!r.ok) expect(r.fields?.joints?.[0]).toBe(`At most ${MAX_BATCH_ACCEPT} joints can be accepted at once; select fewer`);
    const empty = await acceptBatchAction({ note: "", joints: [] });
    expect(empty).toMatchObject({ ok: false, status: 422, fields: { joints: ["Select the joints to accept"] } });

    for (let i = 0; i < MAX_BATCH_ACCEPT + 1; i += 1) await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: new Date(MADE.getTime() + i * 60_000) });
    const all = await acceptBatchAction({ note: "", matching: { job: String(base.jobId) } });
    expect(all).toMatchObject({ ok: false, status: 413 });
    if (!all.ok) expect(all.message).toContain(`at most ${MAX_BATCH_ACCEPT} can be accepted at once`);
    expect(await ownerDb()("joint_states").where({ review_state: "accepted" })).toHaveLength(0);
  }, 60_000);

  it("is for inspectors only", async () => {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    await actAs(await makeUser({ roles: ["clerk"] }));
    expect(await acceptBatchAction({ note: "", joints: [{ jointId: joint.jointId, expectedRevisionNo: 1 }] })).toMatchObject({ ok: false, status: 403 });
    expect(await state(joint.jointId)).toMatchObject({ review_state: "pending-review" });
  });
});
