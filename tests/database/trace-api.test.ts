// The trace JSON API and spreadsheet export through the wrapped route handlers. The export
// is read back with exceljs (a general-purpose spreadsheet library).
import ExcelJS from "exceljs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as origins } from "@/app/api/v1/trace/joints/[id]/route";
import { GET as exportLot } from "@/app/api/v1/trace/lot/export/route";
import { GET as traceLot } from "@/app/api/v1/trace/lot/route";
import { closeDb } from "@/database/client";
import { seed as seedScenario } from "@/database/seeds/01-demo";
import { closeOwnerDb, ownerDb, resetDatabase, userIdByEmail, setOrganisationZoneRow } from "../support/db";
import { requestAs } from "../support/session";

let clerk: { id: number };
let fuser: { id: number };
let inspector: { id: number };
let jointId: number;
const none = { params: Promise.resolve({}) } as never;

beforeAll(async () => {
  await resetDatabase();
  // The scenario without the demo joints: these tests insert exactly the joints they count.
  await seedScenario(ownerDb(), new Date("2026-12-01T12:00:00Z"));
  clerk = { id: await userIdByEmail("clerk@larkmoor-gas.example") };
  fuser = { id: await userIdByEmail("fuser@larkmoor-gas.example") };
  inspector = { id: await userIdByEmail("inspector@larkmoor-gas.example") };
  const id = async (table: string, column: string, value: string) => Number((await ownerDb()(table).where(column, value).first("id")).id);
  const [job, a, b, machine, heater, version] = [await id("jobs", "code", "WO-24152"), await id("coils", "coil_code", "LV-C0004"), await id("coils", "coil_code", "LV-C0001"), await id("fusion_machines", "asset_tag", "FM-201"), await id("heater_plates", "asset_tag", "HP-31"), Number((await ownerDb()("procedure_versions").first("id")).id)];
  const [inserted] = await ownerDb()("joints").insert({
    client_id: "trace-api-1", job_id: job, joint_no: 3, kind: "coil-to-coil", coil_a_id: a, coil_b_id: b, outside_diameter_mm: 60.33, sdr: 11, procedure_version_id: version,
    machine_id: machine, heater_id: heater, fuser_id: fuser.id, made_at: new Date("2026-11-28T09:30:00Z"), station: "2+40", latitude: 41.21881, longitude: -77.21072, plan: "{}", outcome: "within-limits", findings: "[]",
  });
  jointId = Number(inserted);
});

afterAll(async () => {
  await closeDb();
  await closeOwnerDb();
});

describe("GET /api/v1/trace/lot", () => {
  it("is for clerks, inspectors and admins; a search needs a lot or a code", async () => {
    expect((await traceLot(await requestAs(null, "/api/v1/trace/lot?lot=4410021"), none)).status).toBe(401);
    expect((await traceLot(await requestAs(fuser, "/api/v1/trace/lot?lot=4410021"), none)).status).toBe(403);
    const bad = await traceLot(await requestAs(inspector, "/api/v1/trace/lot"), none);
    expect(bad.status).toBe(422);
    expect(((await bad.json()) as { error: { fields: Record<string, string[]> } }).error.fields.lot).toEqual(["Enter a lot (with its manufacturer), or a traceability code or coil id."]);
  });

  it("answers lot → ground with the joint where the lot is on side B", async () => {
    const response = await traceLot(await requestAs(inspector, "/api/v1/trace/lot?manufacturer=Quillfield%20Polymers&lot=4410021"), none);
    const body = (await response.json()) as { lots: unknown[]; coils: { coilCode: string }[]; joints: { id: number; side: string; station: string }[]; truncated: boolean };
    expect(body.lots).toEqual([{ manufacturer: "Quillfield Polymers", lot: "4410021" }]);
    expect(body.coils).toHaveLength(4);
    expect(body.joints).toMatchObject([{ id: jointId, side: "b", station: "2+40" }]);
    expect(body.truncated).toBe(false);
  });

  it("exports the same list as a spreadsheet", async () => {
    await setOrganisationZoneRow("America/Chicago");
    const response = await exportLot(await requestAs(clerk, "/api/v1/trace/lot/export?code=LV-C0002"), none);
    await setOrganisationZoneRow(null);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-disposition")).toBe('attachment; filename="trace-4410021.xlsx"');
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await response.arrayBuffer());
    const joints = book.getWorksheet("Joints")!;
    const header = (joints.getRow(1).values as unknown[]).slice(1) as string[];
    expect(header.slice(0, 6)).toEqual(["Job", "Job name", "Joint", "Joint reference", "Made at (America/Chicago)", "Made at (UTC)"]);
    expect(joints.rowCount).toBe(2);
    const values = (joints.getRow(2).values as unknown[]).slice(1);
    const row = Object.fromEntries(header.map((h, i) => [h, values[i]]));
    expect(row).toMatchObject({ Job: "WO-24152", "Job name": "Orchard Rise service extension", "Made at (UTC)": new Date("2026-11-28T09:30:00Z") });
    // IANA tz database: Chicago is on CST (−06:00) after US DST ended on 2026-11-01, so 09:30Z is 03:30 local.
    expect(row["Made at (America/Chicago)"]).toBe("2026-11-28 03:30 \u221206:00");
    expect(row).toMatchObject({ Station: "2+40", Latitude: 41.21881, Longitude: -77.21072, Fuser: "Robin Ashdown", "Review state": "Pending review", "In the ground": "Yes" });
    expect(row).toMatchObject({ "Component A": "LV-C0004", "Lot A": "4410388", "Component B": "LV-C0001", "Lot B": "4410021", "Lot on side": "B", "Joint id": jointId });
    expect(book.getWorksheet("Coils")!.rowCount).toBe(5);
    expect(await ownerDb()("audit_log").where({ action: "trace-exported", actor_user_id: clerk.id })).toHaveLength(1);
  });
});

describe("GET /api/v1/trace/joints/:id", () => {
  it("answers joint → origins, and 404 for an unknown joint", async () => {
    const response = await origins(await requestAs(clerk, `/api/v1/trace/joints/${jointId}`), { params: Promise.resolve({ id: String(jointId) }) });
    const body = (await response.json()) as { coilA: { lot: string }; coilB: { lot: string }; machine: { pistonAreaMm2: number }; fuser: { name: string }; qualification: { qualified: boolean }; procedure: { code: string; versionNo: number } };
    expect(body.coilA.lot).toBe("4410388");
    expect(body.coilB.lot).toBe("4410021");
    expect(body.machine.pistonAreaMm2).toBe(1006.5);
    expect(body.fuser.name).toBe("Robin Ashdown");
    // source: 49 CFR 192.285(c) — qualified 60 days before 2026-12-01, so qualified on 2026-11-28
    expect(body.qualification.qualified).toBe(true);
    expect(body.procedure).toMatchObject({ code: "LVG-BF-01", versionNo: 1 });
    expect((await origins(await requestAs(clerk, "/api/v1/trace/joints/999999"), { params: Promise.resolve({ id: "999999" }) })).status).toBe(404);
    expect((await origins(await requestAs(fuser, `/api/v1/trace/joints/${jointId}`), { params: Promise.resolve({ id: String(jointId) }) })).status).toBe(403);
  });
});
