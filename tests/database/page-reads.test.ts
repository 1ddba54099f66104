// The reads behind the signed-in pages, each in one round trip (database/query-count.ts
// counts the statements a piece of work sends): the Register's and the review queue's filter
// lists, the review facets and Today's counts — checked against the demo scenario's own rows
// read plainly with the owner connection (the expected values come from the tables, not from
// the code under test). And the lists the server keeps between requests
// (app/_server/reference): served without a query, read again after the app changes them.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { countQueries } from "@/database/query-count";
import { closeDb } from "@/database/client";
import { listRegisterFilterOptions } from "@/database/queries/register";
import { countQueueFacets, listQueueFilterOptions } from "@/database/queries/reviews";
import { listCoilsAwaitingLabel, listRunningExports, reviewQueueSummary } from "@/database/queries/today";
import { currentProcedureVersion, listCurrentVersionOfEveryProcedure } from "@/database/queries/procedures";
import { listUsersWithRole, listUsersWithRoles } from "@/database/queries/users";
import { registerFilterOptions } from "@/app/_server/reference/register-filter-options";
import { currentProcedureVersions, procedureVersionsChanged } from "@/app/_server/reference/procedure-versions";
import { createJob } from "@/app/_server/jobs/create-job";
import { createProcedure } from "@/app/_server/procedures/create-procedure";
import { createJobSchema } from "@/domain/jobs/schemas";
import { createProcedureSchema } from "@/domain/procedures/schemas";
import { ownerDb, resetDatabase, seedDemo } from "../support/db";
import { makeUser } from "../support/users";
import { makeCoil, makeJob, makeProcedure } from "../actions/office-fixtures";

const TODAY = new Date("2026-12-02T09:00:00Z");
const tally = <T>(n: number, counted: { result: T; queries: number }) => {
  expect(counted.queries).toBe(n);
  return counted.result;
};
const sortedBy = <T>(rows: T[], key: (r: T) => string) => [...rows].sort((a, b) => (key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : 0));

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(TODAY);
});

afterAll(async () => {
  await closeDb();
});

describe("one round trip per list", () => {
  it("Register filter choices: every job, the people holding the fuser role, every machine", async () => {
    const options = tally(1, await countQueries(() => listRegisterFilterOptions()));
    const k = ownerDb();
    const jobs = (await k("jobs").select("id", "code", "name")) as { id: number; code: string; name: string }[];
    const fusers = ((await k("users").select("id", "name", "roles")) as { id: number; name: string; roles: string }[]).filter((u) => u.roles.split(",").includes("fuser"));
    const machines = (await k("fusion_machines").select("id", "asset_tag")) as { id: number; asset_tag: string }[];
    expect(jobs.length).toBeGreaterThan(0);
    expect(options.jobs).toEqual(sortedBy(jobs, (j) => j.code).map((j) => ({ id: j.id, label: `${j.code} — ${j.name}` })));
    expect(options.fusers).toEqual(sortedBy(fusers, (u) => u.name).map((u) => ({ id: u.id, label: u.name })));
    expect(options.machines).toEqual(sortedBy(machines, (m) => m.asset_tag).map((m) => ({ id: m.id, label: m.asset_tag })));
  });

  it("review queue: the filter lists and the five facets match the pending joints' own rows", async () => {
    const k = ownerDb();
    const pending = (await k("joint_states as js").join("joints as j", "j.id", "js.joint_id").where("js.review_state", "pending-review").select("j.id", "j.job_id", "j.fuser_id", "j.machine_id", "js.outcome")) as {
      id: number;
      job_id: number;
      fuser_id: number;
      machine_id: number;
      outcome: string;
    }[];
    expect(pending.length).toBeGreaterThan(1);
    const findings = (await k("joint_findings").whereIn("joint_id", pending.map((p) => p.id)).select("joint_id", "parameter")) as { joint_id: number; parameter: string }[];
    const countBy = (values: (string | number)[]) => values.reduce<Record<string, number>>((acc, v) => ({ ...acc, [String(v)]: (acc[String(v)] ?? 0) + 1 }), {});
    const facets = tally(1, await countQueries(() => countQueueFacets({ filter: {} })));
    expect(facets.job).toEqual(countBy(pending.map((p) => p.job_id)));
    expect(facets.fuser).toEqual(countBy(pending.map((p) => p.fuser_id)));
    expect(facets.machine).toEqual(countBy(pending.map((p) => p.machine_id)));
    expect(facets.outcome).toEqual(countBy(pending.map((p) => p.outcome)));
    // A joint counts once per finding parameter, however many findings of that parameter it has.
    expect(facets.finding).toEqual(countBy([...new Set(findings.map((f) => `${f.joint_id}|${f.parameter}`))].map((key) => key.split("|")[1]!)));

    const options = tally(1, await countQueries(() => listQueueFilterOptions()));
    const jobIds = new Set(pending.map((p) => p.job_id));
    const jobs = ((await k("jobs").select("id", "code", "name")) as { id: number; code: string; name: string }[]).filter((j) => jobIds.has(j.id));
    expect(options.jobs).toEqual(sortedBy(jobs, (j) => j.code).map((j) => ({ id: j.id, label: `${j.code} ${j.name}` })));
    expect(options.fusers.map((f) => f.id).sort()).toEqual([...new Set(pending.map((p) => p.fuser_id))].sort());
    expect(options.machines.map((m) => m.id).sort()).toEqual([...new Set(pending.map((p) => p.machine_id))].sort());
  });

  it("Today: each count comes with its rows in one query, and is the count of all, not of the rows shown", async () => {
    const k = ownerDb();
    const pendingCount = Number(((await k("joint_states").where("review_state", "pending-review").count({ n: "*" })) as { n: number }[])[0]!.n);
    const summary = tally(1, await countQueries(() => reviewQueueSummary()));
    expect(summary.count).toBe(pendingCount);
    const oldest = (await k("joint_states").where("review_state", "pending-review").orderBy([{ column: "made_at" }, { column: "joint_id" }]).first("joint_id")) as { joint_id: number };
    expect(summary.oldest?.jointId).toBe(Number(oldest.joint_id));

    await makeCoil();
    await makeCoil();
    const unlabelled = Number(((await k("coils").whereNull("label_printed_at").count({ n: "*" })) as { n: number }[])[0]!.n);
    expect(unlabelled).toBeGreaterThan(1);
    const coils = tally(1, await countQueries(() => listCoilsAwaitingLabel({ limit: 1 })));
    expect(coils.coils).toHaveLength(1);
    expect(coils.count).toBe(unlabelled);

    const clerk = await makeUser({ roles: ["clerk"] });
    for (let i = 0; i < 3; i += 1) await k("exports").insert({ user_id: clerk.id, format: "csv", status: "running", filter: "{}", started_at: new Date(TODAY.getTime() + i * 1000) });
    const running = tally(1, await countQueries(() => listRunningExports({ userId: clerk.id, limit: 2 })));
    expect(running.exports).toHaveLength(2);
    expect(running.count).toBe(3);
    const idle = await makeUser({ roles: ["clerk"] });
    const none = tally(1, await countQueries(() => listRunningExports({ userId: idle.id })));
    expect(none).toEqual({ count: 0, exports: [] });
  });

  it("inspectors and admins in one query, the same people as one query per role", async () => {
    const both = tally(1, await countQueries(() => listUsersWithRoles({ roles: ["inspector", "admin"] })));
    const apart = [...(await listUsersWithRole({ role: "inspector" })), ...(await listUsersWithRole({ role: "admin" }))];
    expect(both.map((u) => u.id).sort()).toEqual([...new Set(apart.map((u) => u.id))].sort());
  });
});

describe("lists kept between requests", () => {
  it("the Register's choices are served without a query and read again after a job is created", async () => {
    await registerFilterOptions();
    expect((await countQueries(() => registerFilterOptions())).queries).toBe(0);
    const admin = await makeUser({ roles: ["admin"] });
    const procedure = await makeProcedure();
    const input = createJobSchema.parse({ code: "PR-KEPT-1", name: "Kept lists job", procedureId: procedure.id });
    const { id } = await createJob(input, { user: { id: admin.id }, requestId: "page-reads-test" });
    const after = await countQueries(() => registerFilterOptions());
    expect(after.queries).toBe(1);
    expect(after.result.jobs).toContainEqual({ id, label: "PR-KEPT-1 — Kept lists job" });
  });

  it("each procedure's current version is the one currentProcedureVersion picks, and a new procedure shows at once", async () => {
    procedureVersionsChanged();
    const procedures = (await ownerDb()("procedures").select("id")) as { id: number }[];
    const ids = procedures.map((p) => Number(p.id));
    const kept = tally(1, await countQueries(() => currentProcedureVersions(ids)));
    for (const [i, id] of ids.entries()) expect(kept[i]?.id ?? null).toBe((await currentProcedureVersion({ procedureId: id }))?.id ?? null);
    expect((await countQueries(() => currentProcedureVersions(ids))).queries).toBe(0);
    expect(await listCurrentVersionOfEveryProcedure()).toHaveLength(kept.filter(Boolean).length);

    const admin = await makeUser({ roles: ["admin"] });
    const created = await createProcedure(createProcedureSchema.parse({ code: "PR-KEPT-2", name: "Kept lists procedure", standard: "astm-f2620" }), { user: { id: admin.id }, requestId: "page-reads-test" });
    const [fresh] = await currentProcedureVersions([created.id]);
    expect(fresh?.id).toBe(created.versionId);
    // A job naming it on the Trench gets that version (the job's procedure, as before).
    const jobId = await makeJob({ procedureId: created.id });
    const job = (await ownerDb()("jobs").where({ id: jobId }).first("procedure_id")) as { procedure_id: number };
    expect((await currentProcedureVersions([Number(job.procedure_id)]))[0]?.id).toBe(created.versionId);
  });
});
