import { requireUser } from "@/app/_lib/page-guard";
import { listDevMail, spoolDir } from "@/database/queries/dev-mailbox";
import { countOutboxByStatus, listOutbox, type MailStatus, type OutboxMail } from "@/database/queries/outbox";
import { mailKindLabel } from "@/domain/mail/digest";
import { RetryButton } from "./_components/retry-button";
import { MailPreference } from "../_components/mail-preference";

export const dynamic = "force-dynamic";

const at = (d: Date | null) => (d ? `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 19)} UTC` : "—");

function stateWords(m: OutboxMail): string {
  switch (m.status) {
    case "queued":
      return m.attempts === 0 ? "Waiting to send" : `Waiting to retry (attempt ${m.attempts + 1} at ${at(m.nextAttemptAt)})`;
    case "sending":
      return "Being sent now";
    case "sent":
      return `Sent ${at(m.sentAt)}`;
    case "failed":
      return `Failed after ${m.attempts} attempts`;
  }
}

const STATUS_LABELS: Record<MailStatus, string> = { queued: "Waiting", sending: "Sending", sent: "Sent", failed: "Failed" };

// Mailbox (admin): every mail Beadline has queued and what became of it, and — in
// development — the messages the local fake mail server received.
export default async function MailboxPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("viewMailbox");
  const params = await searchParams;
  const statusParam = Array.isArray(params.status) ? params.status[0] : params.status;
  const status = (["queued", "sending", "sent", "failed"] as const).find((s) => s === statusParam);
  const [counts, outbox, devMail] = await Promise.all([countOutboxByStatus(), listOutbox({ status, limit: 200 }), listDevMail({ limit: 100 })]);
  const hasSpool = Boolean(spoolDir());
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Mailbox</h1>
      <div className="max-w-md">
        <MailPreference dailyDigest={user.dailyDigest} />
      </div>
      <section aria-labelledby="outbox-heading" className="flex flex-col gap-2">
        <h2 id="outbox-heading" className="text-xl font-bold">
          Outbox
        </h2>
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
            {(Object.keys(STATUS_LABELS) as MailStatus[]).map((s) => (
              <li key={s}>
                <a
                  href={`/mailbox?status=${s}`}
                  aria-current={status === s ? "page" : undefined}
                  className={`inline-flex min-h-touch items-center rounded-md border-2 px-3 font-semibold ${status === s ? "border-brand bg-brand text-white" : s === "failed" && counts.failed ? "border-fail text-fail" : "border-brand text-brand"}`}
                >
                  {STATUS_LABELS[s]} ({counts[s]})
                </a>
              </li>
            ))}
          </ul>
        </nav>
        {outbox.length ? (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Outbox mail, newest first</caption>
              <thead>
                <tr className="border-b-2 border-slate-300">
                  <th scope="col" className="pr-2">Queued</th>
                  <th scope="col" className="pr-2">To</th>
                  <th scope="col" className="pr-2">Subject</th>
                  <th scope="col" className="pr-2">Kind</th>
                  <th scope="col" className="pr-2">State</th>
                  <th scope="col" className="pr-2">Last error</th>
                  <th scope="col">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {outbox.map((m) => (
                  <tr key={m.id} className={`border-b border-slate-200 align-top ${m.status === "failed" ? "bg-fail-light" : ""}`}>
                    <td className="pr-2 whitespace-nowrap">{at(m.createdAt)}</td>
                    <td className="pr-2">{m.to}</td>
                    <th scope="row" className="pr-2 font-normal">
                      {m.subject}
                    </th>
                    <td className="pr-2">{mailKindLabel(m.kind)}</td>
                    <td className={`pr-2 font-semibold ${m.status === "failed" ? "text-fail" : m.status === "sent" ? "text-pass" : ""}`}>{stateWords(m)}</td>
                    <td className="pr-2">{m.lastError ?? ""}</td>
                    <td>{m.status === "failed" ? <RetryButton id={m.id} subject={m.subject} /> : null}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : (
          <p className="text-slate-700">No mail {status ? `is ${STATUS_LABELS[status].toLowerCase()}` : "has been queued yet"}.</p>
        )}
      </section>

      <section aria-labelledby="dev-heading" className="flex flex-col gap-2">
        <h2 id="dev-heading" className="text-xl font-bold">
          Development mail received
        </h2>
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
                          to {m.to.join(", ")} · received {at(m.receivedAt)}
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
      </section>
    </div>
  );
}
