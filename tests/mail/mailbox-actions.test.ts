// Mailbox and Notifications actions: an admin retries a failed mail; anyone chooses how their alerts are grouped.
import { beforeEach, describe, expect, it } from "vitest";
import { retryMailAction } from "@/app/(signed-in)/mailbox/actions";
import { setMailPreferenceAction } from "@/app/(signed-in)/notifications/actions";
import { enqueueMail, listOutbox } from "@/database/queries/outbox";
import { actAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

describe("mailbox actions", () => {
  beforeEach(async () => {
    await resetDatabase();
  });

  it("an admin puts a failed mail back in the queue; others get 403; a mail that is not failed is a conflict", async () => {
    const { id } = await enqueueMail({ to: "x@test.example", subject: "S", bodyText: "B", kind: "test" });
    await ownerDb()("mail_outbox").where({ id }).update({ status: "failed", attempts: 8, last_error: "550" });
    await actAs(await makeUser({ roles: ["inspector"] }));
    expect(await retryMailAction({ id })).toMatchObject({ ok: false, status: 403 });
    const admin = await makeUser({ roles: ["admin"] });
    await actAs(admin);
    expect(await retryMailAction({ id })).toMatchObject({ ok: true });
    expect((await listOutbox())[0]).toMatchObject({ status: "queued", attempts: 0 });
    expect(await ownerDb()("audit_log").where({ action: "mail-retried", actor_user_id: admin.id })).toHaveLength(1);
    expect(await retryMailAction({ id })).toMatchObject({ ok: false, status: 409 });
    expect(await retryMailAction({ id: "abc" })).toMatchObject({ ok: false, status: 422 });
  });

  it("anyone signed in chooses as they happen, hourly or daily; anything else is refused naming the field", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    expect((await ownerDb()("users").where({ id: fuser.id }).first()).mail_grouping).toBe("immediate");
    await actAs(fuser);
    expect(await setMailPreferenceAction({ grouping: "hourly" })).toMatchObject({ ok: true });
    expect((await ownerDb()("users").where({ id: fuser.id }).first()).mail_grouping).toBe("hourly");
    expect(await ownerDb()("audit_log").where({ action: "mail-preference-set", actor_user_id: fuser.id })).toHaveLength(1);
    const refused = await setMailPreferenceAction({ grouping: "weekly" as "daily" });
    expect(refused).toMatchObject({ ok: false, status: 422 });
    expect(JSON.stringify(refused)).toContain("Alert mail for me");
    expect((await ownerDb()("users").where({ id: fuser.id }).first()).mail_grouping).toBe("hourly");
    await actAs(null);
    expect(await setMailPreferenceAction({ grouping: "daily" })).toMatchObject({ ok: false, status: 401 });
  });
});
