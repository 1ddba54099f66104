// The organisation's time zone (Crew screen, admin only): refused to other roles, an unknown
// zone is refused with a message naming the field and writes nothing, a valid one is stored
// with its audit entry, and every reader of the zone (day filters, screens) then uses it.
import { beforeEach, describe, expect, it } from "vitest";
import { setOrganisationTimeZoneAction } from "@/app/(signed-in)/crew/actions";
import { getOrganisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs } from "../support/session";
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
});
