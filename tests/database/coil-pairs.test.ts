// The joints already made between two of a crew's coils (the Trench screen's same-coils
// question), over the full demo scenario: the query gives exactly what a naive reference
// finds — a plain SELECT over both coil columns — newest first, with the cut-out joint's
// review state and the joint that replaced it.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/database/client";
import { listJointsBetweenCoils } from "@/database/queries/joints";
import { closeOwnerDb, ownerDb, resetDatabase, seedDemo } from "../support/db";

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(new Date("2026-12-01T12:00:00Z"));
});

afterAll(async () => {
  await closeDb();
  await closeOwnerDb();
});

describe("listJointsBetweenCoils on the demo scenario", () => {
  it("matches the naive reference for the North crew's coils, newest first", async () => {
    const coils = (await ownerDb()("coils as c").join("crews as k", "k.id", "c.crew_id").where("k.name", "North crew").select("c.id")) as { id: number }[];
    const ids = coils.map((c) => Number(c.id));
    expect(ids.length).toBeGreaterThan(1);
    const [rows] = (await ownerDb().raw(
      `SELECT j.id, a.coil_code AS a, b.coil_code AS b FROM joints j JOIN coils a ON a.id = j.coil_a_id JOIN coils b ON b.id = j.coil_b_id
        WHERE j.coil_a_id IN (${ids.map(() => "?").join(",")}) AND j.coil_b_id IN (${ids.map(() => "?").join(",")}) ORDER BY j.made_at DESC, j.id DESC`,
      [...ids, ...ids],
    )) as unknown as [{ id: number; a: string; b: string }[]];
    const got = await listJointsBetweenCoils({ coilIds: ids });
    expect(rows.length).toBeGreaterThan(0);
    expect(got.map((j) => [j.id, j.coilACode, j.coilBCode])).toEqual(rows.map((r) => [Number(r.id), r.a, r.b]));
  });

  it("carries the cut-out joint's state and the joint that replaced it", async () => {
    const cut = (await ownerDb()("joint_states").where({ review_state: "cut-out" }).whereNotNull("replaced_by_joint_id").first("joint_id", "replaced_by_joint_id")) as { joint_id: number; replaced_by_joint_id: number } | undefined;
    expect(cut).toBeDefined();
    const joint = (await ownerDb()("joints").where({ id: cut!.joint_id }).first("coil_a_id", "coil_b_id")) as { coil_a_id: number; coil_b_id: number };
    const got = await listJointsBetweenCoils({ coilIds: [Number(joint.coil_a_id), Number(joint.coil_b_id)] });
    const found = got.find((j) => j.id === Number(cut!.joint_id));
    expect(found?.reviewState).toBe("cut-out");
    expect(found?.replacedByJointId).toBe(Number(cut!.replaced_by_joint_id));
  });

  it("gives nothing for no coils", async () => {
    expect(await listJointsBetweenCoils({ coilIds: [] })).toEqual([]);
  });
});
