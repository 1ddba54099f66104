// GETs that record something (the audited exports) refuse a browser request sent from another
// site, so a link or image on another site cannot make a signed-in clerk's browser record an
// export they never asked for. Beadline's own screens (same-origin), a typed or bookmarked
// address (none) and scripts (no header) are served and audited as before.
// source: W3C Fetch Metadata Request Headers §2.4 (Sec-Fetch-Site values); OWASP Cross-Site
// Request Forgery Prevention Cheat Sheet, "Fetch Metadata headers" (resource isolation policy).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as registerExport } from "@/app/api/v1/exports/register/route";
import { GET as lotExport } from "@/app/api/v1/trace/lot/export/route";
import { GET as lotCsv } from "@/app/api/v1/trace/lot/csv/route";
import { closeDb } from "@/database/client";
import { ownerDb, resetDatabase, seedDemo, userIdByEmail } from "../support/db";
import { requestAs } from "../support/session";

const noParams = { params: Promise.resolve({}) };
const ROUTES = [
  { label: "register export (CSV)", handler: registerExport, url: "/api/v1/exports/register?format=csv" },
  { label: "lot trace workbook", handler: lotExport, url: "/api/v1/trace/lot/export?lot=4410021" },
  { label: "lot trace CSV", handler: lotCsv, url: "/api/v1/trace/lot/csv?lot=4410021" },
] as const;

/** Audit entries a request wrote (entries carry the request's id). */
async function auditedUnder(requestId: string): Promise<number> {
  const row = (await ownerDb()("audit_log").where({ request_id: requestId }).count({ n: "*" }).first()) as { n: number | string };
  return Number(row.n);
}

describe("GETs that record an export, against requests from other sites", () => {
  let clerk: { id: number };

  beforeAll(async () => {
    await resetDatabase();
    await seedDemo();
    clerk = { id: await userIdByEmail("clerk@larkmoor-gas.example") };
  }, 120_000);

  afterAll(async () => {
    await closeDb();
  });

  for (const route of ROUTES) {
    for (const site of ["cross-site", "same-site"]) {
      it(`${route.label}: Sec-Fetch-Site ${site} is refused with 403 and nothing is recorded`, async () => {
        const requestId = `fetch-metadata-${route.label.replace(/\W+/g, "-")}-${site}`;
        const res = await route.handler(await requestAs(clerk, route.url, { headers: { "sec-fetch-site": site, "sec-fetch-mode": "navigate", "x-request-id": requestId } }), noParams);
        expect(res.status).toBe(403);
        const body = (await res.json()) as { error: { code: string; message: string } };
        expect(body.error.code).toBe("forbidden");
        expect(body.error.message).toContain("Beadline's own screens");
        expect(res.headers.get("x-request-id")).toBe(requestId);
        await new Promise((r) => setTimeout(r, 200));
        expect(await auditedUnder(requestId)).toBe(0);
      });
    }

    for (const site of ["same-origin", "none", null]) {
      it(`${route.label}: ${site === null ? "no Sec-Fetch-Site (a script)" : `Sec-Fetch-Site ${site}`} is served and audited`, async () => {
        const requestId = `fetch-metadata-${route.label.replace(/\W+/g, "-")}-${site ?? "script"}`;
        const res = await route.handler(await requestAs(clerk, route.url, { headers: { ...(site ? { "sec-fetch-site": site } : {}), "x-request-id": requestId } }), noParams);
        expect(res.status).toBe(200);
        await res.arrayBuffer(); // the register export audits as its stream ends
        await expect.poll(() => auditedUnder(requestId), { timeout: 5000 }).toBeGreaterThan(0);
      });
    }
  }
});
