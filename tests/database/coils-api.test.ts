// The coils JSON API through the wrapped route handlers: lookup by scanned text, receiving
// (roles, per-field 422 with nothing written, duplicate 409, 201), status moves.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getCoilById } from "@/app/api/v1/coils/[id]/route";
import { POST as moveStatus } from "@/app/api/v1/coils/[id]/status/route";
import { GET as lookupCoils, POST as receive } from "@/app/api/v1/coils/route";
import { closeDb } from "@/database/client";
import { seed as seedScenario } from "@/database/seeds/01-demo";
import { closeOwnerDb, ownerDb, resetDatabase, userIdByEmail } from "../support/db";
import { requestAs } from "../support/session";

let clerk: { id: number };
let fuser: { id: number };
const none = { params: Promise.resolve({}) } as never;
const params = (id: number) => ({ params: Promise.resolve({ id: String(id) }) });

const coil = {
  coilCode: "LV-C0200",
  manufacturer: "Quillfield Polymers",
  manufacturerCode: "QF",
  lot: "4430777",
  productionDate: "2026-10-20",
  material: "PE4710",
  series: "ips",
  nominalSize: "2",
  sdr: 11,
  length: 152.4,
  lengthUnit: "m",
  traceCode: "QFiAE97D0H123Kj0", // worked by hand from ASTM F2897-23a in tests/e2e/coils.spec.ts
  damageKinds: [],
  endCapsInPlace: true,
};

beforeAll(async () => {
  await resetDatabase();
  // The scenario without the demo joints: these tests insert exactly the joints they count.
  await seedScenario(ownerDb(), new Date("2026-12-01T12:00:00Z"));
  clerk = { id: await userIdByEmail("clerk@larkmoor-gas.example") };
  fuser = { id: await userIdByEmail("fuser@larkmoor-gas.example") };
});

afterAll(async () => {
  await closeDb();
  await closeOwnerDb();
});

describe("GET /api/v1/coils", () => {
  it("lets any signed-in person look a coil up by label URL; listing is for the office", async () => {
    expect((await lookupCoils(await requestAs(null, "/api/v1/coils?code=LV-C0001"), none)).status).toBe(401);
    const found = await lookupCoils(await requestAs(fuser, `/api/v1/coils?code=${encodeURIComponent("http://127.0.0.1:3000/coils/LV-C0004")}`), none);
    expect(found.status).toBe(200);
    expect(((await found.json()) as { coil: { coilCode: string; remainingM: number } }).coil).toMatchObject({ coilCode: "LV-C0004", remainingM: 152.4 });
    const missing = await lookupCoils(await requestAs(fuser, "/api/v1/coils?code=LV-C9999"), none);
    expect(missing.status).toBe(404);
    expect((await lookupCoils(await requestAs(fuser, "/api/v1/coils"), none)).status).toBe(403);
    const list = (await (await lookupCoils(await requestAs(clerk, "/api/v1/coils?status=quarantined"), none)).json()) as { coils: { coilCode: string }[] };
    expect(list.coils.map((c) => c.coilCode)).toEqual(["LV-C0010"]);
  });
});

describe("POST /api/v1/coils", () => {
  it("refuses a fuser (403) and bad input with every field named (422), writing nothing", async () => {
    expect((await receive(await requestAs(fuser, "/api/v1/coils", { json: coil }), none)).status).toBe(403);
    const before = await ownerDb()("coils").count({ n: "*" });
    const bad = await receive(await requestAs(clerk, "/api/v1/coils", { json: { ...coil, lot: "", sdr: 1.5, length: 0, traceCode: "QFiAE97D0H123Kj" } }), none);
    expect(bad.status).toBe(422);
    const body = (await bad.json()) as { error: { message: string; fields: Record<string, string[]> } };
    expect(Object.keys(body.error.fields).sort()).toEqual(["length", "lot", "sdr", "traceCode"]);
    expect(body.error.fields.traceCode).toEqual(["A traceability code has 16 characters; this one has 15"]);
    expect(await ownerDb()("coils").count({ n: "*" })).toEqual(before);
  });

  it("receives a coil (201), then refuses the same coil id (409)", async () => {
    const created = await receive(await requestAs(clerk, "/api/v1/coils", { json: coil }), none);
    expect(created.status).toBe(201);
    const { coil: made } = (await created.json()) as { coil: { id: number; status: string; traceCodeFlags: unknown[] } };
    expect(made).toMatchObject({ status: "in-yard", traceCodeFlags: [] });
    const again = await receive(await requestAs(clerk, "/api/v1/coils", { json: coil }), none);
    expect(again.status).toBe(409);
    const detail = (await (await getCoilById(await requestAs(fuser, `/api/v1/coils/${made.id}`), params(made.id))).json()) as { coil: { lot: string }; events: { toStatus: string; reason: string }[] };
    expect(detail.coil.lot).toBe("4430777");
    expect(detail.events).toMatchObject([{ toStatus: "in-yard", reason: "Received" }]);
  });
});

describe("POST /api/v1/coils/:id/status", () => {
  it("moves a coil onto a trailer, refuses a move the rules forbid, and a stale version", async () => {
    const row = await ownerDb()("coils").where("coil_code", "LV-C0009").first("id", "version");
    const crew = await ownerDb()("crews").where("name", "North crew").first("id");
    const forbidden = await moveStatus(await requestAs(clerk, `/api/v1/coils/${row.id}/status`, { json: { version: row.version, to: "used-up" } }), params(row.id));
    expect(forbidden.status).toBe(422);
    expect(((await forbidden.json()) as { error: { fields: Record<string, string[]> } }).error.fields).toEqual({ to: ["A coil that is in the yard cannot be moved to used up"] });
    const ok = await moveStatus(await requestAs(clerk, `/api/v1/coils/${row.id}/status`, { json: { version: row.version, to: "on-trailer", crewId: crew.id } }), params(row.id));
    expect(ok.status).toBe(200);
    const stale = await moveStatus(await requestAs(clerk, `/api/v1/coils/${row.id}/status`, { json: { version: row.version, to: "in-yard" } }), params(row.id));
    expect(stale.status).toBe(409);
    const after = await ownerDb()("coils").where("id", row.id).first("status", "crew_id");
    expect([after.status, Number(after.crew_id)]).toEqual(["on-trailer", Number(crew.id)]);
    expect((await moveStatus(await requestAs(fuser, `/api/v1/coils/${row.id}/status`, { json: { version: 2, to: "in-yard" } }), params(row.id))).status).toBe(403);
  });
});
