// The Notifications screen shows each person their own mail and waiting alerts only: the
// page is rendered as the signed-in person (the id comes from the session; nothing in the
// request names whose notifications to show), with another person's alerts in the same
// database. source: OWASP Authorization Cheat Sheet (deny by default; check ownership on
// the server, never from a client-supplied id).
import { beforeEach, describe, expect, it } from "vitest";
import { renderToStaticMarkup } from "react-dom/server";
import NotificationsPage from "@/app/(signed-in)/notifications/page";
import { foldNotifications } from "@/app/_server/mail/fold-notifications";
import { listMyNotifications } from "@/app/_server/mail/my-notifications";
import { insertNotification, listOutbox } from "@/database/queries/outbox";
import { findUserById } from "@/database/queries/users";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs } from "../support/session";
import { makeUser } from "../support/users";

describe("Notifications: only one's own", () => {
  beforeEach(async () => {
    await resetDatabase();
  });

  it("a person sees their own sent mail and waiting alerts, never another person's", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const inspector = await makeUser({ roles: ["inspector"] });
    const t0 = new Date("2026-11-24T10:00:00Z");
    const keep = async (userId: number, subject: string, key: string, at: Date) => {
      await insertNotification({ userId, subject, bodyText: `${subject}\nDetails: http://127.0.0.1:3000/joints/9`, kind: "joint-cut-out", linkPath: "/joints/9", dedupeKey: key });
      await ownerDb()("notifications").where({ dedupe_key: key }).update({ created_at: at });
    };
    await keep(fuser.id, "Fuser sent notice", "t:1", t0);
    await keep(inspector.id, "Inspector sent alert", "t:2", t0);
    await foldNotifications({ now: new Date(t0.getTime() + 600_000) });
    expect((await listOutbox()).map((m) => m.userId).sort()).toEqual([fuser.id, inspector.id].sort());
    await keep(fuser.id, "Fuser waiting notice", "t:3", new Date());
    await keep(inspector.id, "Inspector waiting alert", "t:4", new Date());

    const mine = await listMyNotifications({ user: (await findUserById({ id: fuser.id }))! });
    expect(mine.mails.map((m) => m.subject)).toEqual(["Fuser sent notice"]);
    expect(mine.waiting.flatMap((g) => g.items.map((n) => n.subject))).toEqual(["Fuser waiting notice"]);

    await actAs(fuser);
    const html = renderToStaticMarkup(await NotificationsPage());
    expect(html).toContain("Fuser sent notice");
    expect(html).toContain("Fuser waiting notice");
    expect(html).not.toContain("Inspector");
    // The link in the text opens in the app.
    expect(html).toContain('href="/joints/9"');

    await actAs(inspector);
    const theirs = renderToStaticMarkup(await NotificationsPage());
    expect(theirs).toContain("Inspector sent alert");
    expect(theirs).not.toContain("Fuser");
  });
});
