// Jobs screen actions against the real database: create, edit with optimistic locking,
// close (a closed job takes no new joints), role guard and per-field messages.
import { beforeEach, describe, expect, it } from "vitest";
import { createJobAction, setJobStatusAction, updateJobAction } from "@/app/(signed-in)/jobs/actions";
import { findJobById, listCoilsForJob, listOpenJobsForFuser } from "@/database/queries/jobs";
import { canRecordOnJob } from "@/domain/jobs/rules";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs } from "../support/session";
import { makeUser } from "../support/users";
import { countRows, makeCoil, makeCrew, makeProcedure } from "./office-fixtures";

describe("Jobs actions", () => {
  let admin: { id: number };
  let procedureId: number;
  let crewId: number;

  beforeEach(async () => {
    await resetDatabase();
    admin = await makeUser({ roles: ["admin"] });
    procedureId = (await makeProcedure()).id;
    crewId = await makeCrew();
  });

  const jobInput = (extra: Record<string, unknown> = {}) => ({
    code: "WO-9001",
    name: "Test main renewal",
    place: "Test Lane, stations 0+00 to 3+00",
    latitude: "41.2031",
    longitude: "-77.1942",
    startsOn: "2026-11-01",
    endsOn: "",
    procedureId: String(procedureId),
    crewId: String(crewId),
    pipeSizes: "2 IPS SDR 11",
    coilIds: [] as number[],
    ...extra,
  });

  it("creates a job with its joint counter, coils and an audit entry", async () => {
    const coil = await makeCoil();
    await actAs(admin);
    const result = await createJobAction(jobInput({ coilIds: [coil] }));
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const job = await findJobById({ id: result.data.id });
    expect(job).toMatchObject({ code: "WO-9001", status: "open", procedureId, crewId, latitude: 41.2031, longitude: -77.1942, startsOn: "2026-11-01", endsOn: null, version: 1 });
    expect(await ownerDb()("job_counters").where({ job_id: result.data.id }).first()).toMatchObject({ last_joint_no: 0 });
    expect((await listCoilsForJob({ jobId: result.data.id })).map((c) => c.id)).toEqual([coil]);
    expect(await ownerDb()("audit_log").where({ action: "job-created", entity_id: String(result.data.id) })).toHaveLength(1);
  });

  it("refuses other roles with 403 and writes nothing", async () => {
    for (const roles of [["fuser"], ["inspector"], ["clerk"]] as const) {
      const user = await makeUser({ roles: [...roles] });
      await actAs(user);
      const result = await createJobAction(jobInput());
      expect(result).toMatchObject({ ok: false, status: 403 });
    }
    await actAs(null);
    expect(await createJobAction(jobInput())).toMatchObject({ ok: false, status: 401 });
    expect(await countRows("jobs")).toBe(0);
  });

  it("names every bad field and writes nothing", async () => {
    await actAs(admin);
    const result = await createJobAction(jobInput({ code: "WO 9001", name: "", procedureId: "", latitude: "95", longitude: "abc" }));
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.status).toBe(422);
    expect(Object.keys(result.fields ?? {}).sort()).toEqual(["code", "latitude", "longitude", "name", "procedureId"]);
    expect(result.fields?.latitude?.[0]).toMatch(/Latitude must be 90 or less/);
    expect(result.fields?.procedureId?.[0]).toMatch(/procedure/i);
    expect(await countRows("jobs")).toBe(0);
    expect(await countRows("audit_log")).toBe(0);

    // A later check (needs the fields above to be valid): coordinates come in pairs, dates in order.
    const pair = await createJobAction(jobInput({ longitude: "", endsOn: "2026-10-01" }));
    expect(pair).toMatchObject({ ok: false, status: 422 });
    if (!pair.ok) expect(Object.keys(pair.fields ?? {}).sort()).toEqual(["endsOn", "longitude"]);

    // A quarantined coil cannot be assigned; nothing is written.
    const bad = await makeCoil({ status: "quarantined" });
    const coilResult = await createJobAction(jobInput({ coilIds: [bad] }));
    expect(coilResult).toMatchObject({ ok: false, status: 422 });
    if (!coilResult.ok) expect(coilResult.fields?.coilIds?.[0]).toMatch(/quarantined/);
    expect(await countRows("jobs")).toBe(0);
  });

  it("refuses a duplicate job code with a message on the code field", async () => {
    await actAs(admin);
    expect((await createJobAction(jobInput())).ok).toBe(true);
    const again = await createJobAction(jobInput());
    expect(again).toMatchObject({ ok: false, status: 422, fields: { code: ["A job with code WO-9001 already exists."] } });
  });

  it("gives 409 to the second of two edits made from the same version, and keeps the first", async () => {
    await actAs(admin);
    const created = await createJobAction(jobInput());
    if (!created.ok) throw new Error(created.message);
    const first = await updateJobAction({ ...jobInput({ name: "First editor's name" }), id: created.data.id, version: 1 });
    expect(first).toMatchObject({ ok: true, data: { version: 2 } });
    const second = await updateJobAction({ ...jobInput({ name: "Second editor's name" }), id: created.data.id, version: 1 });
    expect(second).toMatchObject({ ok: false, status: 409 });
    if (!second.ok) expect(second.message).toMatch(/changed by someone else.*reload/);
    expect((await findJobById({ id: created.data.id }))?.name).toBe("First editor's name");
    expect(await ownerDb()("audit_log").where({ action: "job-updated" })).toHaveLength(1);
  });

  it("closes a job: it takes no new joints and leaves the fuser's list; it can be reopened", async () => {
    const fuser = await makeUser({ roles: ["fuser"], crewId });
    await actAs(admin);
    const created = await createJobAction(jobInput());
    if (!created.ok) throw new Error(created.message);
    expect((await listOpenJobsForFuser({ userId: fuser.id })).map((j) => j.id)).toEqual([created.data.id]);

    const closed = await setJobStatusAction({ id: created.data.id, version: 1, status: "closed" });
    expect(closed).toMatchObject({ ok: true, data: { status: "closed", version: 2 } });
    const job = await findJobById({ id: created.data.id });
    expect(job && canRecordOnJob(job)).toBe(false);
    expect(await listOpenJobsForFuser({ userId: fuser.id })).toEqual([]);
    expect(await setJobStatusAction({ id: created.data.id, version: 1, status: "open" })).toMatchObject({ ok: false, status: 409 });

    expect(await setJobStatusAction({ id: created.data.id, version: 2, status: "open" })).toMatchObject({ ok: true });
    expect(await ownerDb()("audit_log").whereIn("action", ["job-closed", "job-reopened"])).toHaveLength(2);
  });

  it("lists a fuser's crew jobs and unassigned jobs, not another crew's", async () => {
    const otherCrew = await makeCrew();
    const fuser = await makeUser({ roles: ["fuser"], crewId });
    await actAs(admin);
    const mine = await createJobAction(jobInput({ code: "WO-1" }));
    const theirs = await createJobAction(jobInput({ code: "WO-2", crewId: String(otherCrew) }));
    const anyone = await createJobAction(jobInput({ code: "WO-3", crewId: "" }));
    if (!mine.ok || !theirs.ok || !anyone.ok) throw new Error("setup failed");
    expect((await listOpenJobsForFuser({ userId: fuser.id })).map((j) => j.code)).toEqual(["WO-1", "WO-3"]);
  });
});
