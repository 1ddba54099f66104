// The outbox sender: claims due mails (FOR UPDATE SKIP LOCKED, so several app instances
// share the work without sending a mail twice), sends each over SMTP, and marks it sent —
// or records the failure for a retry with back-off (domain/mail/backoff.ts).
import "server-only";
import type { Knex } from "knex";
import { claimDueMails, markMailFailed, markMailSent } from "@/database/queries/outbox";
import { createSmtpTransport, type MailTransport } from "./transport";

export type SendReport = { claimed: number; sent: number; failed: number; gaveUp: number };

/**
 * One pass: claim up to `limit` due mails, send them one by one, record each result.
 * A transport that fails (server down, refused recipient) leaves the mail queued for a
 * later attempt; after the last attempt it is marked failed and stays visible.
 */
export async function sendDueMails({ now = new Date(), limit = 20, transport, knex }: { now?: Date; limit?: number; transport?: MailTransport; knex?: Knex } = {}): Promise<SendReport> {
  const mails = await claimDueMails({ now, limit }, knex);
  const report: SendReport = { claimed: mails.length, sent: 0, failed: 0, gaveUp: 0 };
  if (mails.length === 0) return report;
  const t = transport ?? createSmtpTransport();
  try {
    for (const mail of mails) {
      try {
        await t.send({ to: mail.to, subject: mail.subject, text: mail.bodyText });
        await markMailSent({ id: mail.id, now: new Date() }, knex);
        report.sent += 1;
      } catch (error) {
        const message = error instanceof Error ? `${(error as { code?: string }).code ? `${(error as { code?: string }).code}: ` : ""}${error.message}` : String(error);
        const next = await markMailFailed({ id: mail.id, attempts: mail.attempts, error: message, now: new Date() }, knex);
        if (next.status === "failed") report.gaveUp += 1;
        else report.failed += 1;
      }
    }
  } finally {
    if (!transport) t.close();
  }
  return report;
}
