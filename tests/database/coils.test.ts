// Coil queries against the real MariaDB: lookup by coil id / label URL / F2897 code, the
// trench draw-down (locked, never negative, a pull longer than what is left refused and
// nothing written), receiving with the inspection verdict, and status moves.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { moveCoil } from "@/app/_server/coils/move-coil";
import { receiveCoil } from "@/app/_server/coils/receive-coil";
import { closeDb, db } from "@/database/client";
import { drawDownCoil } from "@/app/_server/coils/draw-down-coil";
import { findCoilByCode, findCoilByCodeOrTrace, findCoilById, listCoilEvents } from "@/database/queries/coils";
import { receiveCoilSchema } from "@/domain/coils/schemas";
import { AppError } from "@/domain/result";
import { seed as seedScenario } from "@/database/seeds/01-demo";
import { closeOwnerDb, ownerDb, resetDatabase, userIdByEmail } from "../support/db";

// Hand-built from ASTM F2897-23a (worked in tests/domain/coil-life.test.ts): QF, lot 4410021, 2026-08-14, PE4710, coiled pipe, 2" IPS SDR 11.
const CODE_LOT_4410021 = "QFivfn5SWH123Kj0";

let clerkId: number;
let fuserId: number;

async function coilId(code: string): Promise<number> {
  return (await findCoilByCode({ coilCode: code }))!.id;
}

async function caught(promise: Promise<unknown>): Promise<AppError> {
  try {
    await promise;
  } catch (error) {
    return error as AppError;
  }
  throw new Error("expected a refusal");
}

beforeAll(async () => {
  await resetDatabase();
  // The scenario without the demo joints: these tests insert exactly the joints they count.
  await seedScenario(ownerDb(), new Date("2026-12-01T12:00:00Z"));
  clerkId = await userIdByEmail("clerk@larkmoor-gas.example");
  fuserId = await userIdByEmail("fuser@larkmoor-gas.example");
  // Two coils of lot 4410021 carry the lot's F2897 code: one on a trailer, one in use.
  await ownerDb()("coils").whereIn("coil_code", ["LV-C0003", "LV-C0002"]).update({ trace_code: CODE_LOT_4410021 });
});

afterAll(async () => {
  await closeDb();
  await closeOwnerDb();
});

describe("findCoilByCodeOrTrace", () => {
  it("finds a coil by our id, by the label's URL, and by its F2897 code", async () => {
    expect((await findCoilByCodeOrTrace({ code: "LV-C0001" }))?.coilCode).toBe("LV-C0001");
    expect((await findCoilByCodeOrTrace({ code: "http://127.0.0.1:3000/coils/LV-C0004" }))?.coilCode).toBe("LV-C0004");
    // Shared code: the coil in use wins over the one on the trailer.
    expect((await findCoilByCodeOrTrace({ code: CODE_LOT_4410021 }))?.coilCode).toBe("LV-C0002");
  });

  it("prefers the fuser's own crew when a code is shared", async () => {
    const crew = await ownerDb()("coils").where("coil_code", "LV-C0003").first("crew_id");
    await ownerDb()("coils").where("coil_code", "LV-C0002").update({ crew_id: null });
    expect((await findCoilByCodeOrTrace({ code: CODE_LOT_4410021, preferCrewId: Number(crew.crew_id) }))?.coilCode).toBe("LV-C0003");
    await ownerDb()("coils").where("coil_code", "LV-C0002").update({ crew_id: crew.crew_id });
  });

  it("compares F2897 codes case-sensitively and returns null for unknown text", async () => {
    // source: ASTM F2897-23a §3.3 / Table 2 — "a" (10) and "A" (36) are different digits
    expect(await findCoilByCodeOrTrace({ code: CODE_LOT_4410021.toLowerCase() })).toBeNull();
    expect(await findCoilByCodeOrTrace({ code: "LV-C9999" })).toBeNull();
    expect(await findCoilByCodeOrTrace({ code: "   " })).toBeNull();
  });

  it("maps the row to SI numbers, dates and booleans", async () => {
    const coil = (await findCoilByCodeOrTrace({ code: "LV-C0010" }))!;
    expect(coil).toMatchObject({ lengthM: 152.4, remainingM: 152.4, sdr: 11, outsideDiameterMm: 60.33, productionDate: "2026-10-05", status: "quarantined" });
    expect(coil.inspection).toMatchObject({ passed: false, hasDamage: true, endCapsInPlace: true, ovalityPct: 2.1 });
  });
});

describe("drawDownCoil", () => {
  it("subtracts the pull, sets the coil in use and writes the event with the joint", async () => {
    const id = await coilId("LV-C0003"); // on trailer, 152.4 m
    const result = await db().transaction((trx) => drawDownCoil({ coilId: id, pullM: 20.25, jointId: null, userId: fuserId }, trx));
    // common practice (no published source): 152.40 − 20.25 = 132.15 m
    expect(result).toMatchObject({ remainingM: 132.15, status: "in-use", fromStatus: "on-trailer", pulledM: 20.25 });
    const coil = (await findCoilById({ id }))!;
    expect([coil.remainingM, coil.status]).toEqual([132.15, "in-use"]);
    const [event] = await listCoilEvents({ coilId: id });
    expect(event).toMatchObject({ fromStatus: "on-trailer", toStatus: "in-use", pullM: 20.25, remainingM: 132.15, byUserId: fuserId });
  });

  it("refuses a pull longer than what is left with a clear message on the caller's field, and writes nothing", async () => {
    const id = await coilId("LV-C0003");
    const before = (await findCoilById({ id }))!;
    const eventsBefore = (await listCoilEvents({ coilId: id })).length;
    const error = await caught(db().transaction((trx) => drawDownCoil({ coilId: id, pullM: 140, jointId: null, userId: fuserId, field: "lengthAM" }, trx)));
    expect(error).toBeInstanceOf(AppError);
    expect(error.code).toBe("invalid");
    expect(error.message).toBe("LV-C0003 has only 132.15 m left; the pull of 140.00 m is longer");
    expect(error.fields).toEqual({ lengthAM: ["LV-C0003 has only 132.15 m left; the pull of 140.00 m is longer"] });
    const after = (await findCoilById({ id }))!;
    expect([after.remainingM, after.status, after.version]).toEqual([before.remainingM, before.status, before.version]);
    expect((await listCoilEvents({ coilId: id })).length).toBe(eventsBefore);
  });

  it("a failure later in the caller's transaction rolls the draw-down back", async () => {
    const id = await coilId("LV-C0003");
    await expect(
      db().transaction(async (trx) => {
        await drawDownCoil({ coilId: id, pullM: 10, jointId: null, userId: fuserId }, trx);
        throw new Error("joint insert failed");
      }),
    ).rejects.toThrow("joint insert failed");
    expect((await findCoilById({ id }))!.remainingM).toBe(132.15);
  });

  it("pulls the last centimetre to zero — used up — and refuses anything after it", async () => {
    const id = await coilId("LV-C0003");
    const last = await db().transaction((trx) => drawDownCoil({ coilId: id, pullM: 132.15, jointId: null, userId: fuserId }, trx));
    expect(last).toMatchObject({ remainingM: 0, status: "used-up" });
    const error = await caught(db().transaction((trx) => drawDownCoil({ coilId: id, pullM: 0.01, jointId: null, userId: fuserId }, trx)));
    expect(error.message).toBe("LV-C0003 is used up; nothing is left to pull");
    const [row] = await ownerDb()("coils").where("id", id).select("remaining_m");
    expect(Number(row.remaining_m)).toBe(0);
  });

  it("refuses pulls from a quarantined coil and non-positive pulls", async () => {
    const quarantined = await coilId("LV-C0010");
    const q = await caught(db().transaction((trx) => drawDownCoil({ coilId: quarantined, pullM: 5, jointId: null, userId: fuserId }, trx)));
    expect(q.message).toMatch(/^LV-C0010 is quarantined \(Gouge deeper/);
    const other = await coilId("LV-C0004");
    const zero = await caught(db().transaction((trx) => drawDownCoil({ coilId: other, pullM: 0, jointId: null, userId: fuserId }, trx)));
    expect(zero.fields).toEqual({ pullM: ["The length pulled from LV-C0004 must be more than 0 (got 0.00 m)"] });
  });

  it("serialises two simultaneous pulls on one coil: both cannot take more than it has", async () => {
    const id = await coilId("LV-C0009"); // 152.4 m in the yard
    const pull = () => db().transaction((trx) => drawDownCoil({ coilId: id, pullM: 100, jointId: null, userId: fuserId }, trx));
    const results = await Promise.allSettled([pull(), pull()]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const refused = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect((refused.reason as AppError).message).toBe("LV-C0009 has only 52.40 m left; the pull of 100.00 m is longer");
    expect((await findCoilById({ id }))!.remainingM).toBe(52.4);
  });
});

describe("receiveCoil and moveCoil", () => {
  const ctx = () => ({ user: { id: clerkId }, requestId: "test-request" });
  const form = {
    coilCode: "LV-C0100",
    manufacturer: "Quillfield Polymers",
    manufacturerCode: "QF",
    lot: "4410021",
    productionDate: "2026-08-14",
    material: "PE4710",
    series: "ips",
    nominalSize: "2",
    sdr: "11",
    length: "500",
    lengthUnit: "ft",
    traceCode: CODE_LOT_4410021,
    damageKinds: [],
    ovalityPct: "1.8",
    endCapsInPlace: true,
  };

  it("receives a clean coil into the yard with its event and audit entry", async () => {
    const received = await receiveCoil(receiveCoilSchema.parse(form), ctx());
    expect(received).toMatchObject({ coilCode: "LV-C0100", status: "in-yard", inspectionPassed: true, traceCodeFlags: [] });
    const coil = (await findCoilById({ id: received.id }))!;
    // source: NIST SP 811, 500 ft = 152.4 m
    expect(coil).toMatchObject({ lengthM: 152.4, remainingM: 152.4, traceCode: CODE_LOT_4410021, status: "in-yard" });
    expect(coil.inspection.receivedByName).toBe("Morgan Tull");
    const audit = await ownerDb()("audit_log").where({ action: "coil-received", entity_id: String(received.id) });
    expect(audit).toHaveLength(1);
  });

  it("refuses a coil that disagrees with its code without a reason, and writes nothing", async () => {
    const before = await ownerDb()("coils").count({ n: "*" });
    const parsed = receiveCoilSchema.safeParse({ ...form, coilCode: "LV-C0102", lot: "4410388" });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => [i.path.join("."), i.message])).toEqual([["disagreementReason", "The code disagrees with Lot: correct the fields or the code, or say why the coil is saved as it is."]]);
    expect(await ownerDb()("coils").count({ n: "*" })).toEqual(before);
  });

  it("quarantines a coil that fails inspection and keeps the code's disagreements, with the reason in the audit log", async () => {
    const reason = "Print line reads lot 4410388; the maker is checking the tag";
    const received = await receiveCoil(receiveCoilSchema.parse({ ...form, coilCode: "LV-C0101", lot: "4410388", damageKinds: ["kink"], disagreementReason: reason }), ctx());
    const [entry] = await ownerDb()("audit_log").where({ action: "coil-received", entity_id: String(received.id) });
    expect(JSON.parse(entry.details)).toMatchObject({ lot: "4410388", traceCode: CODE_LOT_4410021, disagreementReason: reason });
    expect(received.status).toBe("quarantined");
    const coil = (await findCoilById({ id: received.id }))!;
    expect(coil.statusReason).toBe("Failed receipt inspection: Kinked or buckled pipe");
    expect(coil.inspection.damageKinds).toEqual(["kink"]);
    expect(coil.traceCodeFlags).toEqual([{ field: "lot", message: "The code carries lot 4410021, the form says 4410388" }]);
  });

  it("refuses a duplicate coil id and writes nothing", async () => {
    const before = await ownerDb()("coils").count({ n: "*" });
    const error = await caught(receiveCoil(receiveCoilSchema.parse(form), ctx()));
    expect(error.code).toBe("conflict");
    expect(error.fields).toEqual({ coilCode: ["Coil id LV-C0100 is already on file."] });
    expect(await ownerDb()("coils").count({ n: "*" })).toEqual(before);
  });

  it("moves a coil under the rules: a trailer needs a crew, a stale version conflicts", async () => {
    const coil = (await findCoilByCode({ coilCode: "LV-C0100" }))!;
    const noCrew = await caught(moveCoil({ coilId: coil.id, version: coil.version, to: "on-trailer" }, ctx()));
    expect(noCrew.fields).toEqual({ crewId: ["Choose the crew whose trailer the coil goes on"] });
    const [crew] = await ownerDb()("crews").where("name", "River crew").select("id");
    await moveCoil({ coilId: coil.id, version: coil.version, to: "on-trailer", crewId: Number(crew.id) }, ctx());
    const moved = (await findCoilById({ id: coil.id }))!;
    expect([moved.status, moved.crewName, moved.version]).toEqual(["on-trailer", "River crew", coil.version + 1]);
    const stale = await caught(moveCoil({ coilId: coil.id, version: coil.version, to: "in-yard" }, ctx()));
    expect(stale.code).toBe("conflict");
    const noReason = await caught(moveCoil({ coilId: coil.id, version: moved.version, to: "quarantined" }, ctx()));
    expect(noReason.fields).toEqual({ reason: ["Say why the coil is quarantined"] });
    await moveCoil({ coilId: coil.id, version: moved.version, to: "quarantined", reason: "Lot recall notice 2026-12" }, ctx());
    expect((await findCoilById({ id: coil.id }))!).toMatchObject({ status: "quarantined", statusReason: "Lot recall notice 2026-12" });
  });
});
