// The organisation's time zone (Crew screen, admin only): refused to other roles, an unknown
// zone is refused with a message naming the field and writes nothing, a valid one is stored
// with its audit entry, and every reader of the zone (day filters, screens) then uses it.
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { setOrganisationTimeZoneAction } from "@/app/(signed-in)/crew/actions";
import { GET as registerGet } from "@/app/api/v1/register/route";
import { SETTINGS_TTL_MS, getOrganisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs, requestAs } from "../support/session";
import { makeUser } from "../support/users";

describe("organisation time zone", () => {
  let admin: { id: number };
  beforeEach(async () => {
    await resetDatabase();
    admin = await makeUser({ roles: ["admin"] });
  });

  it("defaults to the server's zone until an admin chooses one", async () => {
    const zone = await getOrganisationTimeZone();
    expect(zone.isChosen).toBe(false);
    // The server's own zone, as the runtime reports it (Etc/UTC is spelt UTC), or UTC.
    const server = Intl.DateTimeFormat().resolvedOptions().timeZone;
    expect([server, "UTC"]).toContain(zone.timeZone);
  });

  it("refuses other roles with 403 and writes nothing", async () => {
    for (const role of ["fuser", "inspector", "clerk"] as const) {
      await actAs(await makeUser({ roles: [role] }));
      expect(await setOrganisationTimeZoneAction({ timeZone: "America/Chicago" })).toMatchObject({ ok: false, status: 403 });
    }
    expect(await ownerDb()("organisation_settings").count({ n: "*" }).first()).toMatchObject({ n: 0 });
  });

  it("names the field for an unknown zone, an abbreviation or an empty choice, and writes nothing", async () => {
    await actAs(admin);
    for (const timeZone of ["Mars/Olympus_Mons", "CST", ""]) {
      const result = await setOrganisationTimeZoneAction({ timeZone });
      expect(result).toMatchObject({ ok: false, status: 422, fields: { timeZone: [expect.stringMatching(/^Time zone /)] } });
      if (!result.ok) expect(result.fields?.timeZone).toHaveLength(1);
    }
    expect(await ownerDb()("organisation_settings").count({ n: "*" }).first()).toMatchObject({ n: 0 });
    expect(await ownerDb()("audit_log").where({ action: "organisation-time-zone-changed" })).toHaveLength(0);
  });

  it("stores a chosen zone with its audit entry; a second change replaces it", async () => {
    await actAs(admin);
    expect(await setOrganisationTimeZoneAction({ timeZone: "America/Chicago" })).toMatchObject({ ok: true, data: { timeZone: "America/Chicago" } });
    expect(await getOrganisationTimeZone()).toEqual({ timeZone: "America/Chicago", isChosen: true });
    expect(await setOrganisationTimeZoneAction({ timeZone: "Europe/Berlin" })).toMatchObject({ ok: true });
    expect(await getOrganisationTimeZone()).toEqual({ timeZone: "Europe/Berlin", isChosen: true });
    const rows = await ownerDb()("organisation_settings");
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ id: 1, time_zone: "Europe/Berlin", updated_by: admin.id });
    const audit = await ownerDb()("audit_log").where({ action: "organisation-time-zone-changed" }).orderBy("id");
    expect(audit).toHaveLength(2);
    expect(JSON.parse(audit[1].details)).toEqual({ before: "America/Chicago", after: "Europe/Berlin" });
    expect(audit[1].actor_user_id).toBe(admin.id);
  });

  // design rule: the zone is kept in the process (app/_server/cache.ts); a change made
  // through this instance is seen by its very next request, a change made elsewhere (another
  // instance, written straight into the row here) within SETTINGS_TTL_MS.
  describe("kept in the process", () => {
    afterEach(() => {
      vi.useRealTimers();
    });

    async function registerZone(user: { id: number }): Promise<string> {
      const res = await registerGet(await requestAs(user, "/api/v1/register?limit=5"), { params: Promise.resolve({}) });
      expect(res.status).toBe(200);
      return ((await res.json()) as { timeZone: string }).timeZone;
    }

    it("a change through the Crew screen is seen by the next request at once, although the old zone was kept", async () => {
      const clerk = await makeUser({ roles: ["clerk"] });
      const server = (await getOrganisationTimeZone()).timeZone;
      const other = server === "Pacific/Chatham" ? "Asia/Kathmandu" : "Pacific/Chatham";
      expect(await registerZone(clerk)).toBe(server); // read, and now kept
      await actAs(admin);
      expect(await setOrganisationTimeZoneAction({ timeZone: other })).toMatchObject({ ok: true });
      expect(await registerZone(clerk)).toBe(other);
      expect(await getOrganisationTimeZone()).toEqual({ timeZone: other, isChosen: true });
    });

    it("a change written by another instance is seen here once SETTINGS_TTL_MS has passed", async () => {
      const server = (await getOrganisationTimeZone()).timeZone; // kept
      const other = server === "Pacific/Chatham" ? "Asia/Kathmandu" : "Pacific/Chatham";
      await ownerDb()("organisation_settings").insert({ id: 1, time_zone: other, updated_by: admin.id });
      vi.useFakeTimers({ toFake: ["Date"] });
      vi.setSystemTime(Date.now() + SETTINGS_TTL_MS + 1_000);
      expect(await getOrganisationTimeZone()).toEqual({ timeZone: other, isChosen: true });
    });
  });
});
