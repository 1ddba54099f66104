// Sign-in, throttling, the session guard and the role guard against the real database.
import { beforeEach, describe, expect, it } from "vitest";
import { z } from "zod";
import { signInAction } from "@/app/(signed-out)/sign-in/actions";
import { setUnitSystemAction } from "@/app/(signed-in)/actions";
import { GET as sessionGet, POST as sessionPost } from "@/app/api/v1/session/route";
import { defineAction, defineRoute } from "@/app/_lib/guard";
import { FREE_FAILURES } from "@/domain/crew/throttle";
import { actAs, requestAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser, TEST_PASSWORD } from "../support/users";
import { testRequestState } from "../support/request-state";

const adminOnlyAction = defineAction({ permission: "manageCrew", schema: z.object({ n: z.number({ error: "n must be a number." }) }) }, async (input) => input.n * 2);
const adminOnlyRoute = defineRoute({ permission: "manageCrew" }, async () => Response.json({ ok: true }));

describe("sign-in", () => {
  beforeEach(async () => {
    await resetDatabase();
    testRequestState.cookies.clear();
  });

  it("signs in with the right password, seals a new session and audits it", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    testRequestState.cookies.set("beadline_session", "an-old-attacker-chosen-value");
    const result = await signInAction({ email: u.email, password: TEST_PASSWORD });
    expect(result.ok).toBe(true);
    const sealed = testRequestState.cookies.get("beadline_session");
    expect(sealed).toBeTruthy();
    expect(sealed).not.toBe("an-old-attacker-chosen-value"); // session fixation: always a new seal
    const audit = await ownerDb()("audit_log").where({ action: "sign-in", entity_id: String(u.id) });
    expect(audit).toHaveLength(1);
  });

  it("refuses a wrong password, an unknown account and a deactivated account with one generic message", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    const off = await makeUser({ roles: ["fuser"], isActive: false });
    const messages = new Set<string>();
    for (const attempt of [
      { email: u.email, password: "wrong-password-123" },
      { email: "nobody@test.example", password: TEST_PASSWORD },
      { email: off.email, password: TEST_PASSWORD },
    ]) {
      const r = await signInAction(attempt);
      expect(r.ok).toBe(false);
      if (!r.ok) messages.add(r.message);
    }
    expect(messages.size).toBe(1);
    expect(await ownerDb()("audit_log").where({ action: "sign-in-failed" }).count({ n: "*" }).first()).toMatchObject({ n: 3 });
  });

  it("names each bad field", async () => {
    const r = await signInAction({ email: "not-an-email", password: "" });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.status).toBe(422);
      expect(Object.keys(r.fields ?? {}).sort()).toEqual(["email", "password"]);
    }
  });

  it(`makes a new client wait after ${FREE_FAILURES.account + 1} failures on an account, even with the right password`, async () => {
    const u = await makeUser({ roles: ["fuser"] });
    for (let i = 0; i <= FREE_FAILURES.account; i++) {
      expect((await signInAction({ email: u.email, password: `wrong-${i}-password` })).ok).toBe(false);
    }
    const r = await signInAction({ email: u.email, password: TEST_PASSWORD });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.status).toBe(429);
    expect(await ownerDb()("audit_log").where({ action: "sign-in-throttled" }).count({ n: "*" }).first()).toMatchObject({ n: 1 });
  });

  it("the JSON API signs in and sets an httpOnly SameSite=Lax cookie", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: u.email, password: TEST_PASSWORD } }));
    expect(res.status).toBe(200);
    const cookie = res.headers.get("set-cookie") ?? "";
    expect(cookie).toMatch(/beadline_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });
});

describe("guards", () => {
  beforeEach(resetDatabase);

  it("an action answers 401 signed out and 403 for the wrong role", async () => {
    await actAs(null);
    expect(await setUnitSystemAction({ unitSystem: "us" })).toMatchObject({ ok: false, status: 401 });
    const fuser = await makeUser({ roles: ["fuser"] });
    await actAs(fuser);
    expect(await adminOnlyAction({ n: 2 })).toMatchObject({ ok: false, status: 403 });
    const admin = await makeUser({ roles: ["admin"] });
    await actAs(admin);
    expect(await adminOnlyAction({ n: 2 })).toEqual({ ok: true, data: 4 });
    expect(await adminOnlyAction({ n: "2" } as never)).toMatchObject({ ok: false, status: 422, fields: { n: ["n must be a number."] } });
  });

  it("a route handler answers 401 signed out and 403 for the wrong role", async () => {
    const ctx = { params: Promise.resolve({}) };
    expect((await adminOnlyRoute(await requestAs(null, "/x"), ctx)).status).toBe(401);
    const clerk = await makeUser({ roles: ["clerk"] });
    const refused = await adminOnlyRoute(await requestAs(clerk, "/x"), ctx);
    expect(refused.status).toBe(403);
    expect(await refused.json()).toEqual({ error: { code: "forbidden", message: "Your role does not allow this." } });
    const admin = await makeUser({ roles: ["admin"] });
    expect((await adminOnlyRoute(await requestAs(admin, "/x"), ctx)).status).toBe(200);
  });

  it("a deactivated person loses access on the next request", async () => {
    const u = await makeUser({ roles: ["inspector"] });
    const request = await requestAs(u, "/api/v1/session");
    const ctx = { params: Promise.resolve({}) };
    expect((await sessionGet(request.clone(), ctx)).status).toBe(200);
    await ownerDb()("users").where({ id: u.id }).update({ is_active: false });
    expect((await sessionGet(request.clone(), ctx)).status).toBe(401);
  });

  it("a role change takes effect on the next request", async () => {
    const u = await makeUser({ roles: ["admin"] });
    await actAs(u);
    expect((await adminOnlyAction({ n: 1 })).ok).toBe(true);
    await ownerDb()("users").where({ id: u.id }).update({ roles: "clerk" });
    expect(await adminOnlyAction({ n: 1 })).toMatchObject({ ok: false, status: 403 });
  });
});
