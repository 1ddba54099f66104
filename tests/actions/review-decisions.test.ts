// Review decisions against the real database: who may decide, what a decision writes
// (revision, projection, audit entry, the fuser's notice), and optimistic locking.
// Rules: Beadline's joint states and its rule "Nobody reviews a joint they made
// themselves" — common practice (no published source) for separation of duties in QA.
import { beforeEach, describe, expect, it } from "vitest";
import { decideJointAction } from "@/app/(signed-in)/review/actions";
import { POST as decisionPost } from "@/app/api/v1/review/joints/[id]/decision/route";
import { decideJoint } from "@/app/_server/review/decide-joint";
import { findUserById } from "@/database/queries/users";
import { makeReviewBase, makeReviewJoint, type ReviewBase } from "@/fixtures/review-joints";
import { actAs, requestAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

const MADE = new Date("2026-11-20T09:30:00Z");

async function revisions(jointId: number) {
  return ownerDb()("joint_revisions").where({ joint_id: jointId }).orderBy("revision_no");
}
async function state(jointId: number) {
  return ownerDb()("joint_states").where({ joint_id: jointId }).first();
}

describe("review decisions", () => {
  let base: ReviewBase;
  let fuser: { id: number };
  let inspector: { id: number };

  beforeEach(async () => {
    await resetDatabase();
    base = await makeReviewBase(ownerDb());
    fuser = await makeUser({ roles: ["fuser"] });
    inspector = await makeUser({ roles: ["inspector"] });
  });

  it("an inspector accepts a joint: revision 2 'accepted', projection moved, audit entry, all with who/when/why", async () => {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    expect(joint.check.outcome).toBe("within-limits");
    await actAs(inspector);
    const r = await decideJointAction({ jointId: joint.jointId, decision: "accepted", note: "Bead even all round", expectedRevisionNo: 1 });
    expect(r).toMatchObject({ ok: true, data: { jointId: joint.jointId, revisionNo: 2, reviewState: "accepted" } });
    const revs = await revisions(joint.jointId);
    expect(revs.map((x) => [x.revision_no, x.kind, x.review_state])).toEqual([
      [1, "recorded", "pending-review"],
      [2, "accepted", "accepted"],
    ]);
    expect(revs[1]).toMatchObject({ by_user_id: inspector.id, reason: "Bead even all round" });
    expect(revs[1].at).toBeInstanceOf(Date);
    expect(await state(joint.jointId)).toMatchObject({ review_state: "accepted", revision_no: 2 });
    const audit = await ownerDb()("audit_log").where({ action: "joint-accepted", entity_type: "joint", entity_id: String(joint.jointId) });
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ actor_user_id: inspector.id });
    expect(audit[0].request_id).toBeTruthy();
    expect(JSON.parse(audit[0].details)).toMatchObject({ revisionNo: 2, note: "Bead even all round" });
  });

  it("an inspector cuts out an out-of-limits joint; the fuser is told to remake it", async () => {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE, fault: "cooling-short" });
    expect(joint.check.outcome).toBe("out-of-limits");
    await actAs(inspector);
    const r = await decideJointAction({ jointId: joint.jointId, decision: "cut-out", note: "Cooling cut short; remake", expectedRevisionNo: 1 });
    expect(r.ok).toBe(true);
    expect(await state(joint.jointId)).toMatchObject({ review_state: "cut-out", revision_no: 2 });
    expect((await revisions(joint.jointId))[1]).toMatchObject({ kind: "cut-out", reason: "Cooling cut short; remake" });
    expect(await ownerDb()("audit_log").where({ action: "joint-cut-out", entity_id: String(joint.jointId) })).toHaveLength(1);
    const fuserRecord = await findUserById({ id: fuser.id });
    const mail = await ownerDb()("notifications").where({ kind: "joint-cut-out" });
    expect(mail).toHaveLength(1);
    expect(mail[0].user_id).toBe(fuserRecord!.id);
    expect(mail[0].body_text).toContain("Cooling cut short; remake");
    // The fuser may not open Review: the notice links to the joint's own page.
    expect(mail[0].link_path).toBe(`/joints/${joint.jointId}`);
  });

  it("refuses a fuser, a clerk and an inspector deciding their own joint with 403, writing nothing", async () => {
    const clerk = await makeUser({ roles: ["clerk"] });
    const inspectorWhoFuses = await makeUser({ roles: ["fuser", "inspector"] });
    const other = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    const own = await makeReviewJoint(ownerDb(), base, { fuserId: inspectorWhoFuses.id, madeAt: MADE });
    for (const [who, jointId] of [
      [fuser, other.jointId],
      [clerk, other.jointId],
      [inspectorWhoFuses, own.jointId],
    ] as const) {
      await actAs(who);
      const r = await decideJointAction({ jointId, decision: "accepted", note: "looks fine", expectedRevisionNo: 1 });
      expect(r).toMatchObject({ ok: false, status: 403, code: "forbidden" });
    }
    await actAs(inspectorWhoFuses);
    const r = await decideJointAction({ jointId: own.jointId, decision: "accepted", note: "", expectedRevisionNo: 1 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/made .* yourself/);
    // The same person may decide a joint somebody else made.
    const allowed = await decideJointAction({ jointId: other.jointId, decision: "accepted", note: "", expectedRevisionNo: 1 });
    expect(allowed.ok).toBe(true);
    expect(await revisions(own.jointId)).toHaveLength(1);
    expect(await ownerDb()("audit_log").where({ entity_id: String(own.jointId) })).toHaveLength(0);
  });

  it("refuses a signed-out caller with 401", async () => {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    await actAs(null);
    expect(await decideJointAction({ jointId: joint.jointId, decision: "accepted", note: "", expectedRevisionNo: 1 })).toMatchObject({ ok: false, status: 401 });
  });

  it("names the note when a cut-out has no reason or an out-of-limits joint is accepted without one (422, nothing written)", async () => {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE, fault: "heater-cold" });
    await actAs(inspector);
    const cut = await decideJointAction({ jointId: joint.jointId, decision: "cut-out", note: "", expectedRevisionNo: 1 });
    expect(cut).toMatchObject({ ok: false, status: 422 });
    if (!cut.ok) expect(Object.keys(cut.fields ?? {})).toEqual(["note"]);
    const accept = await decideJointAction({ jointId: joint.jointId, decision: "accepted", note: "", expectedRevisionNo: 1 });
    expect(accept).toMatchObject({ ok: false, status: 422 });
    if (!accept.ok) expect(accept.fields?.note?.[0]).toMatch(/out of limits/);
    const bad = await decideJointAction({ jointId: "x", decision: "maybe", expectedRevisionNo: 0 } as never);
    expect(bad).toMatchObject({ ok: false, status: 422 });
    if (!bad.ok) expect(Object.keys(bad.fields ?? {}).sort()).toEqual(["decision", "expectedRevisionNo", "jointId"]);
    expect(await revisions(joint.jointId)).toHaveLength(1);
    expect(await state(joint.jointId)).toMatchObject({ review_state: "pending-review", revision_no: 1 });
  });

  it("a decision on a revision that is no longer current gets 409 with a clear message, and changes nothing", async () => {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE, fault: "changeover-long" });
    const second = await makeUser({ roles: ["inspector"], name: "Second Inspector" });
    await actAs(inspector);
    expect((await decideJointAction({ jointId: joint.jointId, decision: "cut-out", note: "Changeover too slow", expectedRevisionNo: 1 })).ok).toBe(true);
    await actAs(second);
    const late = await decideJointAction({ jointId: joint.jointId, decision: "accepted", note: "Looks acceptable to me", expectedRevisionNo: 1 });
    expect(late).toMatchObject({ ok: false, status: 409, code: "conflict" });
    if (!late.ok) expect(late.message).toMatch(/changed while you were looking at it \(Cut out by .+ at \d{4}-\d\d-\d\d \d\d:\d\d [+\u2212]\d\d:\d\d\)\. Nothing was saved/);
    expect(await revisions(joint.jointId)).toHaveLength(2);
    expect(await state(joint.jointId)).toMatchObject({ review_state: "cut-out", revision_no: 2 });
  });

  it("two inspectors deciding the same joint at the same moment: one wins, the other gets 409", async () => {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE, fault: "bead-small" });
    const second = await makeUser({ roles: ["inspector"] });
    const url = `/api/v1/review/joints/${joint.jointId}/decision`;
    const params = { params: Promise.resolve({ id: String(joint.jointId) }) };
    const [a, b] = await Promise.all([
      decisionPost(await requestAs(inspector, url, { json: { decision: "cut-out", note: "Bead too small", expectedRevisionNo: 1 } }), params),
      decisionPost(await requestAs(second, url, { json: { decision: "accepted", note: "Bead acceptable on re-measure", expectedRevisionNo: 1 } }), params),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const loser = a.status === 409 ? a : b;
    expect(((await loser.json()) as { error: { code: string; message: string } }).error).toMatchObject({ code: "conflict" });
    const revs = await revisions(joint.jointId);
    expect(revs).toHaveLength(2);
    expect((await state(joint.jointId)).review_state).toBe(revs[1].review_state);
    expect(await ownerDb()("audit_log").whereIn("action", ["joint-accepted", "joint-cut-out"])).toHaveLength(1);
  });

  it("the unique (joint, revision) key stops a second writer even without the row lock", async () => {
    // Simulates a writer that skipped the FOR UPDATE check: revision 2 already exists.
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    await ownerDb()("joint_revisions").insert({ joint_id: joint.jointId, revision_no: 2, kind: "accepted", by_user_id: inspector.id, review_state: "accepted", reason: "first" });
    const user = (await findUserById({ id: inspector.id }))!;
    await expect(decideJoint({ jointId: joint.jointId, decision: "accepted", note: "second", expectedRevisionNo: 1 }, { user, requestId: "t" })).rejects.toMatchObject({ code: "conflict" });
    expect(await revisions(joint.jointId)).toHaveLength(2);
    expect(await state(joint.jointId)).toMatchObject({ revision_no: 1, review_state: "pending-review" });
  });
});
