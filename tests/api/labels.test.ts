// Label downloads through the wrapped route handlers: the QR in a rendered label decodes
// (with jsQR, a general-purpose QR decoder) to the record's address; who may download;
// bad input; fetching a label records nothing (a GET only renders: a link on another site
// must not stamp a coil as printed), the print action records it once.
import jsQR from "jsqr";
import { PNG } from "pngjs";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as coilLabel } from "@/app/api/v1/labels/coils/[id]/route";
import { GET as jointLabel } from "@/app/api/v1/labels/joints/[id]/route";
import { markLabelsPrintedAction } from "@/app/(signed-in)/labels/actions";
import { closeDb } from "@/database/client";
import { seed as seedScenario } from "@/database/seeds/01-demo";
import { closeOwnerDb, ownerDb, resetDatabase, userIdByEmail } from "../support/db";
import { actAs, requestAs } from "../support/session";
import { makeUser } from "../support/users";

let clerk: { id: number };
let fuser: { id: number };
let inspector: { id: number };
let coilId: number;
let jointId: number;

function decodeQr(png: Buffer): string | null {
  const image = PNG.sync.read(png);
  return jsQR(new Uint8ClampedArray(image.data.buffer, image.data.byteOffset, image.data.byteLength), image.width, image.height)?.data ?? null;
}

const params = (id: number | string) => ({ params: Promise.resolve({ id: String(id) }) });

beforeAll(async () => {
  await resetDatabase();
  // The scenario without the demo joints: these tests insert exactly the joints they count.
  await seedScenario(ownerDb(), new Date("2026-12-01T12:00:00Z"));
  clerk = { id: await userIdByEmail("clerk@larkmoor-gas.example") };
  fuser = { id: await userIdByEmail("fuser@larkmoor-gas.example") };
  inspector = await makeUser({ roles: ["inspector"] });
  coilId = Number((await ownerDb()("coils").where("coil_code", "LV-C0011").first("id")).id); // label never printed in the seed
  const job = await ownerDb()("jobs").where("code", "WO-24117").first("id");
  const version = await ownerDb()("procedure_versions").first("id");
  const machine = await ownerDb()("fusion_machines").first("id");
  const heater = await ownerDb()("heater_plates").first("id");
  const [id] = await ownerDb()("joints").insert({
    client_id: "labels-test-1", job_id: job.id, joint_no: 17, kind: "coil-to-coil", coil_a_id: coilId, outside_diameter_mm: 60.33, sdr: 11,
    procedure_version_id: version.id, machine_id: machine.id, heater_id: heater.id, fuser_id: fuser.id, made_at: new Date("2026-11-30T10:15:00Z"),
    station: "4+75", plan: "{}", outcome: "within-limits", findings: "[]",
  });
  jointId = Number(id);
});

afterAll(async () => {
  delete process.env.BEADLINE_PUBLIC_URL;
  await closeDb();
  await closeOwnerDb();
});

describe("coil label download", () => {
  it("refuses signed-out visitors (401) and roles that do not print coil labels (403)", async () => {
    expect((await coilLabel(await requestAs(null, `/api/v1/labels/coils/${coilId}`), params(coilId))).status).toBe(401);
    expect((await coilLabel(await requestAs(fuser, `/api/v1/labels/coils/${coilId}`), params(coilId))).status).toBe(403);
  });

  it("names the bad field (422) and an unknown coil (404), and stamps nothing", async () => {
    const bad = await coilLabel(await requestAs(clerk, `/api/v1/labels/coils/${coilId}?format=gif&dpi=5`), params(coilId));
    expect(bad.status).toBe(422);
    const body = (await bad.json()) as { error: { fields: Record<string, string[]> } };
    expect(Object.keys(body.error.fields).sort()).toEqual(["dpi", "format"]);
    expect((await coilLabel(await requestAs(clerk, "/api/v1/labels/coils/999999"), params(999999))).status).toBe(404);
    const row = await ownerDb()("coils").where("id", coilId).first("label_printed_at");
    expect(row.label_printed_at).toBeNull();
  });

  it("renders a PNG whose QR decodes to the coil's page at the request's origin, and records nothing", async () => {
    const response = await coilLabel(await requestAs(clerk, `/api/v1/labels/coils/${coilId}?format=png`), params(coilId));
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("image/png");
    expect(response.headers.get("content-disposition")).toBe('attachment; filename="coil-LV-C0011.png"');
    const png = Buffer.from(await response.arrayBuffer());
    // source: jsQR (general-purpose QR decoder from the npm registry)
    expect(decodeQr(png)).toBe("http://127.0.0.1:3000/coils/LV-C0011");
    // source: RFC 9110 §9.2.1 (GET is safe: it must not change the resource's state)
    const row = await ownerDb()("coils").where("id", coilId).first("label_printed_at");
    expect(row.label_printed_at).toBeNull();
    expect(await ownerDb()("audit_log").where({ action: "coil-label-printed", entity_id: String(coilId) })).toHaveLength(0);
  });

  it("the print action (a POST) records the download once, saying how", async () => {
    await actAs(clerk);
    const result = await markLabelsPrintedAction({ coilIds: [coilId], how: "png" });
    expect(result).toMatchObject({ ok: true, data: { count: 1 } });
    await coilLabel(await requestAs(clerk, `/api/v1/labels/coils/${coilId}?format=png`), params(coilId)); // the file itself: no second entry
    const row = await ownerDb()("coils").where("id", coilId).first("label_printed_at");
    expect(row.label_printed_at).toBeInstanceOf(Date);
    const entries = await ownerDb()("audit_log").where({ action: "coil-label-printed", entity_id: String(coilId) });
    expect(entries).toHaveLength(1);
    expect(JSON.parse(String(entries[0].details))).toMatchObject({ how: "png" });
  });

  it("renders an SVG (rasterised by librsvg) whose QR decodes to BEADLINE_PUBLIC_URL, with the clear text beside it", async () => {
    process.env.BEADLINE_PUBLIC_URL = "https://beadline.larkmoor-gas.example/";
    try {
      const response = await coilLabel(await requestAs(clerk, `/api/v1/labels/coils/${coilId}?format=svg&stock=letter-4x2`), params(coilId));
      expect(response.headers.get("content-type")).toBe("image/svg+xml; charset=utf-8");
      const svg = await response.text();
      expect(svg).toContain('width="101.6mm" height="50.8mm"');
      for (const text of ["LV-C0011", '2" IPS SDR 11', "PE4710", "Quillfield Polymers", "Lot 4420560", "Length 152.4 m"]) expect(svg).toContain(`>${text.replace(/"/g, "&quot;")}</text>`);
      const png = await sharp(Buffer.from(svg), { density: 300 }).flatten({ background: "#ffffff" }).png().toBuffer();
      expect(decodeQr(png)).toBe("https://beadline.larkmoor-gas.example/coils/LV-C0011");
    } finally {
      delete process.env.BEADLINE_PUBLIC_URL;
    }
  });
});

describe("joint tag download", () => {
  it("lets an inspector download a tag whose QR opens the joint page", async () => {
    expect((await jointLabel(await requestAs(fuser, `/api/v1/labels/joints/${jointId}`), params(jointId))).status).toBe(403);
    const response = await jointLabel(await requestAs(inspector, `/api/v1/labels/joints/${jointId}?format=png&dpi=200`), params(jointId));
    expect(response.status).toBe(200);
    // source: jsQR (general-purpose QR decoder from the npm registry)
    expect(decodeQr(Buffer.from(await response.arrayBuffer()))).toBe(`http://127.0.0.1:3000/joints/${jointId}`);
    const svg = await (await jointLabel(await requestAs(inspector, `/api/v1/labels/joints/${jointId}?format=svg`), params(jointId))).text();
    for (const text of ["Joint 17", "WO-24117", "Fenwick Lane main renewal", "Made 2026-11-30", "Station 4+75"]) expect(svg).toContain(`>${text}</text>`);
  });
});
