import { requireUser } from "@/app/_lib/page-guard";
import { listDevMail, spoolDir } from "@/database/queries/dev-mailbox";
import { countOutboxByStatus, listOutbox, type MailStatus } from "@/database/queries/outbox";
import { mailKindLabel } from "@/domain/mail/grouping";
import { MAIL_STATUSES, MAIL_STATUS_LABELS, mailStateWords } from "@/domain/mail/states";
import { DataTable } from "@/components/ui/data-table";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { SectionCard } from "@/components/ui/section-card";
import { RetryButton } from "./_components/retry-button";

export const dynamic = "force-dynamic";

const at = (d: Date | null, timeZone: string) => (d ? formatInstant(d, "second", timeZone) : "—");

// Mailbox (admin): every mail Beadline has queued and what became of it, and — in
// development — the messages the local fake mail server received.
export default async function MailboxPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requireUser("viewMailbox");
  const timeZone = await organisationTimeZone();
  const params = await searchParams;
  const statusParam = Array.isArray(params.status) ? params.status[0] : params.status;
  const status = MAIL_STATUSES.find((s) => s === statusParam);
  const [counts, outbox, devMail] = await Promise.all([countOutboxByStatus(), listOutbox({ status, limit: 200 }), listDevMail({ limit: 100 })]);
  const hasSpool = Boolean(spoolDir());
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Mailbox</h1>
      <p className="max-w-3xl text-slate-700">
        Every mail Beadline has made for anyone. Each person reads their own mail, and chooses how their alerts are grouped, on the{" "}
        <a href="/notifications" className="font-semibold text-brand underline">
          Notifications
        </a>{" "}
        screen.
      </p>
      <SectionCard id="outbox-heading" title="Outbox" className="flex flex-col gap-2">
        <p>
          Alerts wait here until the mail server takes them; a mail that cannot be sent is retried with growing pauses and, after the last attempt, stays here as failed.
        </p>
        <nav aria-label="Outbox by state">
          <ul className="flex flex-wrap gap-2">
            <li>
              <a href="/mailbox" aria-current={!status ? "page" : undefined} className={`inline-flex min-h-touch items-center rounded-md border-2 px-3 font-semibold ${!status ? "border-brand bg-brand text-white" : "border-brand text-brand"}`}>
                All ({counts.queued + counts.sending + counts.sent + counts.failed})
              </a>
            </li>
            {(Object.keys(MAIL_STATUS_LABELS) as MailStatus[]).map((s) => (
              <li key={s}>
                <a
                  href={`/mailbox?status=${s}`}
                  aria-current={status === s ? "page" : undefined}
                  className={`inline-flex min-h-touch items-center rounded-md border-2 px-3 font-semibold ${status === s ? "border-brand bg-brand text-white" : s === "failed" && counts.failed ? "border-fail text-fail" : "border-brand text-brand"}`}
                >
                  {MAIL_STATUS_LABELS[s]} ({counts[s]})
                </a>
              </li>
            ))}
          </ul>
        </nav>
        <DataTable
          caption="Outbox mail, newest first"
          isCaptionHidden
          isDense
          rows={outbox}
          rowKey={(m) => m.id}
          rowClassName={(m) => (m.status === "failed" ? "bg-fail-light" : "")}
          empty={<span className="text-slate-700">No mail {status ? `is ${MAIL_STATUS_LABELS[status].toLowerCase()}` : "has been queued yet"}.</span>}
          columns={[
            { header: "Queued", className: "whitespace-nowrap", cell: (m) => at(m.createdAt, timeZone) },
            { header: "To", cell: (m) => m.to },
            { header: "Subject", isRowHeader: true, cell: (m) => m.subject },
            { header: "Kind", cell: (m) => mailKindLabel(m.kind) },
            { header: "State", cell: (m) => <span className={`font-semibold ${m.status === "failed" ? "text-fail" : m.status === "sent" ? "text-pass" : ""}`}>{mailStateWords(m, (d) => at(d, timeZone))}</span> },
            { header: "Last error", cell: (m) => m.lastError ?? "" },
            { header: <span className="sr-only">Actions</span>, cell: (m) => (m.status === "failed" ? <RetryButton id={m.id} subject={m.subject} /> : null) },
          ]}
        />
      </SectionCard>

      <SectionCard id="dev-heading" title="Development mail received" className="flex flex-col gap-2">
        {hasSpool ? (
          <>
            <p>Messages the local fake mail server received (development and tests only; nothing leaves this machine).</p>
            {devMail.length ? (
              <ul aria-label="Received messages" className="flex flex-col gap-2">
                {devMail.map((m) => (
                  <li key={m.file} className="rounded-md border-2 border-slate-300 bg-white p-3">
                    <details>
                      <summary className="min-h-touch cursor-pointer">
                        <span className="font-semibold">{m.subject || "(no subject)"}</span>
                        <span className="block text-sm text-slate-700">
                          to {m.to.join(", ")} · received {at(m.receivedAt, timeZone)}
                        </span>
                      </summary>
                      <pre className="mt-2 whitespace-pre-wrap break-words font-sans text-sm">{m.bodyText}</pre>
                    </details>
                  </li>
                ))}
              </ul>
            ) : (
              <p className="text-slate-700">No messages have arrived yet.</p>
            )}
          </>
        ) : (
          <p className="text-slate-700">This server sends through a real mail server (MAIL_SPOOL_DIR is not set), so there is no development mailbox to show.</p>
        )}
      </SectionCard>
    </div>
  );
}
