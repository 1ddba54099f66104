// Crew actions against the real database: people (add, roles, deactivate, reset password;
// never the last active admin) and qualifications under 49 CFR 192.285 (record a
// (re)qualification with optional evidence, record a failed production-joint test).
import { beforeEach, describe, expect, it } from "vitest";
import { addPersonAction, recordQualificationAction, recordQualificationFailureAction, resetPasswordAction, updatePersonAction } from "@/app/(signed-in)/crew/actions";
import { userFromSealedCookie } from "@/app/_lib/session";
import { findAttachmentById } from "@/database/queries/attachments";
import { listQualificationsForUser, qualificationStatusOverview } from "@/database/queries/qualifications";
import { findUserById } from "@/database/queries/users";
import { getObject } from "@/app/_server/storage/object-store";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs, sealedCookieFor } from "../support/session";
import { makeUser, TEST_PASSWORD } from "../support/users";
import { countRows, makeCrew, makeProcedure } from "./office-fixtures";

const today = () => new Date().toISOString().slice(0, 10);
const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);

describe("Crew actions: people", () => {
  let admin: { id: number };
  beforeEach(async () => {
    await resetDatabase();
    admin = await makeUser({ roles: ["admin"] });
  });

  it("adds a person with roles and crew, stores only a hash, and audits it", async () => {
    const crewId = await makeCrew();
    await actAs(admin);
    const result = await addPersonAction({ name: "Jo Testwell", email: "Jo.Testwell@test.example", roles: ["fuser", "inspector"], password: TEST_PASSWORD, unitSystem: "us", crewId });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const person = await findUserById({ id: result.data.id });
    expect(person).toMatchObject({ email: "jo.testwell@test.example", roles: ["fuser", "inspector"], unitSystem: "us", crewId, isActive: true });
    const row = await ownerDb()("users").where({ id: result.data.id }).first();
    expect(row.password_hash).toMatch(/^\$2[aby]\$/);
    const audit = await ownerDb()("audit_log").where({ action: "person-added" }).first();
    expect(audit.details).not.toContain(TEST_PASSWORD);
  });

  it("refuses other roles with 403 and names every bad field", async () => {
    await actAs(await makeUser({ roles: ["inspector"] }));
    expect(await addPersonAction({ name: "Nope", email: "nope@test.example", roles: ["fuser"], password: TEST_PASSWORD })).toMatchObject({ ok: false, status: 403 });
    await actAs(admin);
    const users = await countRows("users");
    const bad = await addPersonAction({ name: "", email: "not-an-address", roles: [], password: "short" });
    expect(bad.ok).toBe(false);
    if (!bad.ok) {
      expect(bad.status).toBe(422);
      expect(Object.keys(bad.fields ?? {}).sort()).toEqual(["email", "name", "password", "roles"]);
      expect(bad.fields?.roles?.[0]).toBe("Choose at least one role.");
    }
    const taken = await addPersonAction({ name: "Second Admin", email: (await findUserById({ id: admin.id }))!.email, roles: ["admin"], password: TEST_PASSWORD });
    expect(taken).toMatchObject({ ok: false, status: 422, fields: { email: [expect.stringMatching(/already has an account/)] } });
    const ownName = await addPersonAction({ name: "Marigold Fenwick", email: "marigold@test.example", roles: ["fuser"], password: "marigoldfenwick" });
    expect(ownName).toMatchObject({ ok: false, status: 422, fields: { password: [expect.stringMatching(/name or e-mail/)] } });
    expect(await countRows("users")).toBe(users);
  });

  it("never removes the last active admin, by role or by deactivation", async () => {
    await actAs(admin);
    const me = (await findUserById({ id: admin.id }))!;
    const dropRole = await updatePersonAction({ id: admin.id, version: me.version, roles: ["inspector"], isActive: true, crewId: null });
    expect(dropRole).toMatchObject({ ok: false, status: 422, fields: { roles: [expect.stringMatching(/last active administrator/)] } });
    const deactivate = await updatePersonAction({ id: admin.id, version: me.version, roles: ["admin"], isActive: false, crewId: null });
    expect(deactivate).toMatchObject({ ok: false, status: 422, fields: { isActive: [expect.stringMatching(/last active administrator/)] } });
    expect(await findUserById({ id: admin.id })).toMatchObject({ roles: ["admin"], isActive: true, version: me.version });

    // With a second active admin, one of them may step down.
    const second = await makeUser({ roles: ["admin"] });
    expect(await updatePersonAction({ id: admin.id, version: me.version, roles: ["inspector"], isActive: true, crewId: null })).toMatchObject({ ok: true });
    await actAs(second);
    const s = (await findUserById({ id: second.id }))!;
    expect(await updatePersonAction({ id: second.id, version: s.version, roles: ["clerk"], isActive: true, crewId: null })).toMatchObject({ ok: false, status: 422 });
  });

  it("two admins deactivating each other at once: exactly one succeeds", async () => {
    const other = await makeUser({ roles: ["admin"] });
    const a = (await findUserById({ id: admin.id }))!;
    const b = (await findUserById({ id: other.id }))!;
    const { updatePersonAccess } = await import("@/app/_server/crew/update-person-access");
    const results = await Promise.allSettled([
      updatePersonAccess({ id: b.id, version: b.version, roles: ["admin"], isActive: false, crewId: null }, { user: a, requestId: "a" }),
      updatePersonAccess({ id: a.id, version: a.version, roles: ["admin"], isActive: false, crewId: null }, { user: b, requestId: "b" }),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const admins = await ownerDb()("users").where({ is_active: true }).whereRaw("FIND_IN_SET('admin', roles) > 0");
    expect(admins).toHaveLength(1);
  });

  it("deactivation and password reset end the person's open sessions; 409 on a stale edit", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const cookie = await sealedCookieFor(fuser);
    expect(await userFromSealedCookie(cookie)).not.toBeNull();
    await actAs(admin);
    expect(await resetPasswordAction({ id: fuser.id, password: "a brand new passphrase 42" })).toMatchObject({ ok: true });
    expect(await userFromSealedCookie(cookie)).toBeNull();
    expect(await ownerDb()("audit_log").where({ action: "password-reset", entity_id: String(fuser.id) })).toHaveLength(1);

    const cookie2 = await sealedCookieFor(fuser);
    const current = (await findUserById({ id: fuser.id }))!;
    expect(await updatePersonAction({ id: fuser.id, version: current.version, roles: ["fuser"], isActive: false, crewId: null })).toMatchObject({ ok: true });
    expect(await userFromSealedCookie(cookie2)).toBeNull();
    const stale = await updatePersonAction({ id: fuser.id, version: current.version, roles: ["fuser", "clerk"], isActive: true, crewId: null });
    expect(stale).toMatchObject({ ok: false, status: 409 });
    expect(await findUserById({ id: fuser.id })).toMatchObject({ isActive: false, roles: ["fuser"] });
    expect(await ownerDb()("audit_log").where({ action: "person-deactivated" })).toHaveLength(1);
  });
});

describe("Crew actions: qualifications (49 CFR 192.285)", () => {
  let admin: { id: number };
  let fuser: { id: number };
  let procedureId: number;
  beforeEach(async () => {
    await resetDatabase();
    admin = await makeUser({ roles: ["admin"] });
    fuser = await makeUser({ roles: ["fuser"] });
    procedureId = (await makeProcedure()).id;
  });

  const input = (extra: Record<string, unknown> = {}) => ({ userId: fuser.id, procedureId, qualifiedOn: today(), method: "visual-bend", specimenResult: "3 straps bent 180°, no voids, no failure in the joint", evaluator: "Dana Pellworth", ...extra });

  it("records a requalification for a lapsed person; the status becomes current", async () => {
    // source: 49 CFR 192.285(c) — requalify at intervals not exceeding 15 months: a qualification 500 days old has lapsed.
    await ownerDb()("qualifications").insert({ user_id: fuser.id, procedure_id: procedureId, qualified_on: daysAgo(500), method: "ultrasonic", specimen_result: "no flaws", evaluator: "X" });
    expect((await qualificationStatusOverview({ userId: fuser.id }))[0]?.status.state).toBe("lapsed");
    await actAs(admin);
    const result = await recordQualificationAction(input());
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.data.status).toMatchObject({ qualified: true, state: "current", lastQualifiedOn: today() });
    expect((await qualificationStatusOverview({ userId: fuser.id }))[0]?.status.state).toBe("current");
    expect(await ownerDb()("audit_log").where({ action: "qualification-recorded", entity_id: String(fuser.id) })).toHaveLength(1);
  });

  it("stores optional evidence in the object store with its SHA-256", async () => {
    await actAs(admin);
    // The 8-byte PNG signature (ISO/IEC 15948 / RFC 2083 §3.1) followed by a few bytes.
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3, 4]);
    const form = new FormData();
    for (const [k, v] of Object.entries(input())) form.set(k, String(v));
    form.set("evidence", new File([png], "specimen.png", { type: "image/png" }));
    const result = await recordQualificationAction(form);
    expect(result.ok).toBe(true);
    const [q] = await listQualificationsForUser({ userId: fuser.id });
    expect(q?.evidenceAttachmentId).not.toBeNull();
    const attachment = await findAttachmentById({ id: q!.evidenceAttachmentId! });
    expect(attachment).toMatchObject({ kind: "qualification-evidence", contentType: "image/png", sizeBytes: 12, originalName: "specimen.png" });
    // source: SHA-256 computed by Node's crypto (general-purpose library), not by the code under test.
    const { createHash } = await import("node:crypto");
    expect(attachment?.sha256).toBe(createHash("sha256").update(png).digest("hex"));
    const stored = await getObject({ key: attachment!.objectKey });
    expect(Buffer.from(stored!.body).equals(Buffer.from(png))).toBe(true);

    const fake = new FormData();
    for (const [k, v] of Object.entries(input({ qualifiedOn: daysAgo(1) }))) fake.set(k, String(v));
    fake.set("evidence", new File(["<html>not a picture</html>"], "x.png", { type: "image/png" }));
    expect(await recordQualificationAction(fake)).toMatchObject({ ok: false, status: 415 });
    expect(await countRows("qualifications")).toBe(1);
  });

  it("refuses other roles, names bad fields, refuses future dates, and writes nothing", async () => {
    await actAs(fuser);
    expect(await recordQualificationAction(input())).toMatchObject({ ok: false, status: 403 });
    await actAs(await makeUser({ roles: ["inspector"] }));
    expect(await recordQualificationFailureAction({ userId: fuser.id, procedureId, failedOn: today(), notes: "x" })).toMatchObject({ ok: false, status: 403 });
    await actAs(admin);
    const bad = await recordQualificationAction(input({ qualifiedOn: "2026-13-01", method: "looked-at-it", specimenResult: "", evaluator: "" }));
    expect(bad.ok).toBe(false);
    if (!bad.ok) {
      expect(bad.status).toBe(422);
      expect(Object.keys(bad.fields ?? {}).sort()).toEqual(["evaluator", "method", "qualifiedOn", "specimenResult"]);
      expect(bad.fields?.qualifiedOn?.[0]).toMatch(/real date/);
    }
    const future = await recordQualificationAction(input({ qualifiedOn: "2999-01-01" }));
    expect(future).toMatchObject({ ok: false, status: 422, fields: { qualifiedOn: [expect.stringMatching(/in the future/)] } });
    expect(await countRows("qualifications")).toBe(0);
    expect(await countRows("audit_log")).toBe(0);
  });

  it("gives 409 when the same qualification is recorded twice", async () => {
    await actAs(admin);
    expect((await recordQualificationAction(input())).ok).toBe(true);
    const again = await recordQualificationAction(input());
    expect(again).toMatchObject({ ok: false, status: 409 });
    expect(await countRows("qualifications")).toBe(1);
  });

  it("a failed production-joint test ends the qualification until the person requalifies", async () => {
    await actAs(admin);
    expect((await recordQualificationAction(input({ qualifiedOn: daysAgo(30) }))).ok).toBe(true);
    const failed = await recordQualificationFailureAction({ userId: fuser.id, procedureId, failedOn: daysAgo(2), notes: "Joint 14 failed the bend test at the fusion line" });
    // source: 49 CFR 192.285(c) — requalify "after any production joint is found unacceptable by testing under §192.513".
    expect(failed).toMatchObject({ ok: true, data: { status: { qualified: false, state: "requalification-needed" } } });
    const requalified = await recordQualificationAction(input({ qualifiedOn: daysAgo(1) }));
    expect(requalified).toMatchObject({ ok: true, data: { status: { qualified: true } } });
  });
});
