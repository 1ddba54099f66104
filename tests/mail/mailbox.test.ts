// The development mailbox reader and the periodic alert scan. Decoding is checked against
// the RFCs' own examples and against real messages produced by nodemailer (a
// general-purpose mail library) and received by the fake SMTP server.
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { freePort } from "@/database/local/mariadb";
import { startLocalMailServer, type LocalMailServer } from "@/database/local/mail-server";
import { decodeEncodedWords, decodeQuotedPrintable, listDevMail, parseRawMessage } from "@/database/queries/dev-mailbox";

import { createSmtpTransport } from "@/app/_server/mail/transport";
import { scanAndEnqueueAlerts } from "@/app/_server/mail/scan-alerts";
import { makeReviewBase } from "@/fixtures/review-joints";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

describe("decoding spooled messages", () => {
  it.each([
    // source: RFC 2047 §8 (examples of encoded words)
    ["=?ISO-8859-1?Q?Keld_J=F8rn_Simonsen?=", "Keld Jørn Simonsen"],
    ["=?ISO-8859-1?Q?Andr=E9?= Pirard", "André Pirard"],
    ["=?ISO-8859-1?B?SWYgeW91IGNhbiByZWFkIHRoaXMgeW8=?= =?ISO-8859-2?B?dSB1bmRlcnN0YW5kIHRoZSBleGFtcGxlLg==?=", "If you can read this you understand the example."],
    ["(=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=)", "(ab)"],
    ["(=?ISO-8859-1?Q?a?=  \r\n  =?ISO-8859-1?Q?b?=)".replace(/\r\n/, ""), "(ab)"],
    ["(=?ISO-8859-1?Q?a_b?=)", "(a b)"],
    ["(=?ISO-8859-1?Q?a?= b)", "(a b)"],
  ])("encoded words %s", (encoded, decoded) => {
    expect(decodeEncodedWords(encoded)).toBe(decoded);
  });

  it("quoted-printable soft line breaks and escapes", () => {
    // source: RFC 2045 §6.7 rule (5), the soft line break example
    expect(new TextDecoder().decode(decodeQuotedPrintable("Now's the time =\r\nfor all folk to come=\r\n to the aid of their country."))).toBe("Now's the time for all folk to come to the aid of their country.");
    // source: RFC 2045 §6.7 rule (1): "=" followed by two hexadecimal digits is that octet
    expect(new TextDecoder().decode(decodeQuotedPrintable("caf=C3=A9 =3D 5"))).toBe("café = 5");
  });

  it("a folded header and a multipart message's text part", () => {
    const raw = [
      "From: a@x.example",
      "To: b@x.example",
      "Subject: a long",
      "  folded subject",
      'Content-Type: multipart/alternative; boundary="zz"',
      "",
      "--zz",
      "Content-Type: text/plain; charset=utf-8",
      "Content-Transfer-Encoding: base64",
      "",
      Buffer.from("Heater plate 230 °C").toString("base64"),
      "--zz",
      "Content-Type: text/html",
      "",
      "<p>x</p>",
      "--zz--",
    ].join("\r\n");
    expect(parseRawMessage(raw)).toMatchObject({ subject: "a long folded subject", headerTo: "b@x.example", bodyText: "Heater plate 230 °C" });
  });

  describe("messages nodemailer sends to the fake server", () => {
    let server: LocalMailServer;
    let spool: string;
    let port: number;
    beforeAll(async () => {
      spool = mkdtempSync(path.join(os.tmpdir(), "beadline-mailbox-test-"));
      port = await freePort();
      server = await startLocalMailServer({ port, spoolDir: spool });
    });
    afterAll(async () => {
      await server.stop();
      rmSync(spool, { recursive: true, force: true });
    });

    it("come back with their UTF-8 subject, recipients and body", async () => {
      const subject = "Prüfung: Schweißnaht bei −5 °C — Naht 7 außerhalb der Grenzen, bitte prüfen Sie die Abkühlzeit";
      const body = ["Heizelement 232 °C, Abkühlung 2 min 23 s ≥ Mindestwert; Wulst 1,6 mm — alles geprüft und für gut befunden, über 76 Zeichen lang damit umgebrochen wird.", "", "Zweite Zeile: ½ in, 90 psi."].join("\n");
      const t = createSmtpTransport({ port });
      await t.send({ to: "inspector@test.example", subject, text: body });
      await t.send({ to: "other@test.example", subject: "plain ascii", text: "hello" });
      t.close();
      const mine = await listDevMail({ dir: spool, to: "inspector@test.example" });
      expect(mine).toHaveLength(1);
      expect(mine[0]).toMatchObject({ subject, headerTo: "inspector@test.example", to: ["inspector@test.example"], bodyText: body });
      expect((await listDevMail({ dir: spool })).map((m) => m.subject).sort()).toEqual([subject, "plain ascii"].sort());
    });

    it("treat a missing spool folder as an empty mailbox", async () => {
      expect(await listDevMail({ dir: path.join(spool, "nope") })).toEqual([]);
    });
  });
});

describe("the periodic alert scan", () => {
  beforeEach(async () => {
    await resetDatabase();
  });

  it("queues qualification lapse alerts to the fuser and admins, heater-check alerts to admins, once each", async () => {
    const base = await makeReviewBase(ownerDb()); // its heater plate has never been checked
    const admin = await makeUser({ roles: ["admin"] });
    const lapsing = await makeUser({ roles: ["fuser"], name: "Lapsing Fuser" });
    const lapsed = await makeUser({ roles: ["fuser"], name: "Lapsed Fuser" });
    const current = await makeUser({ roles: ["fuser"], name: "Current Fuser" });
    const gone = await makeUser({ roles: ["fuser"], name: "Former Fuser", isActive: false });
    const q = (userId: number, qualifiedOn: string) => ({ user_id: userId, procedure_id: base.procedureId, qualified_on: qualifiedOn, method: "visual-bend", specimen_result: "passed", evaluator: "Test" });
    // source: 49 CFR 192.285(c) — requalify once each calendar year at intervals not
    // exceeding 15 months: 2025-09-18 + 15 months = 2026-12-18, 16 days after 2026-12-02
    // (due within 30 days); 2025-06-30 + 15 months = 2026-09-30, before 2026-12-02 (lapsed).
    await ownerDb()("qualifications").insert([q(lapsing.id, "2025-09-18"), q(lapsed.id, "2025-06-30"), q(current.id, "2026-10-01"), q(gone.id, "2025-06-30")]);
    const now = new Date("2026-12-02T08:00:00Z");

    const first = await scanAndEnqueueAlerts(now);
    expect(first.alerts).toBe(3); // lapsing, lapsed, heater (the inactive person is left out)
    const kept = () => ownerDb()("notifications as n").join("users as u", "u.id", "n.user_id").select("n.kind", "n.subject", "n.body_text", "n.link_path", "u.email", "u.id as user_id");
    const mail = (await kept()) as { kind: string; subject: string; body_text: string; link_path: string; email: string; user_id: number }[];
    const byKind = (kind: string) => mail.filter((m) => m.kind === kind).map((m) => m.email).sort();
    expect(byKind("qualification-lapsing")).toEqual([admin.email, lapsing.email].sort());
    expect(byKind("qualification-lapsed")).toEqual([admin.email, lapsed.email].sort());
    expect(byKind("heater-check-overdue")).toEqual([admin.email]);
    expect(mail.find((m) => m.kind === "qualification-lapsing")!.subject).toBe(`Qualification lapses 2026-12-18: Lapsing Fuser, P-${base.jobCode.slice(3)}`);
    // Each reader gets a page they may open: the admin the person's Crew page, the fuser Today.
    expect(mail.find((m) => m.kind === "qualification-lapsing" && m.user_id === admin.id)!.link_path).toBe(`/crew/${lapsing.id}`);
    expect(mail.find((m) => m.kind === "qualification-lapsing" && m.user_id === lapsing.id)!.link_path).toBe("/");
    expect(mail.find((m) => m.kind === "heater-check-overdue")!.link_path).toMatch(/^\/equipment\/heaters\/\d+$/);

    const again = await scanAndEnqueueAlerts(new Date(now.getTime() + 3_600_000));
    expect(again.queued).toBe(0);
    expect(await kept()).toHaveLength(mail.length);
  });
});
