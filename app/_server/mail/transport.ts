// The SMTP transport (nodemailer), configured from SMTP_HOST, SMTP_PORT and MAIL_FROM. In
// development and tests these point at the local fake server (database/local/mail-server.ts).
// Short timeouts: a mail server that hangs must not hold an outbox claim for long.
import "server-only";
import nodemailer, { type Transporter } from "nodemailer";

export type MailTransport = { send: (mail: { to: string; subject: string; text: string; messageId?: string }) => Promise<void>; close: () => void };

export function mailFrom(): string {
  return process.env.MAIL_FROM || "Beadline <beadline@localhost>";
}

/**
 * The Message-ID of an outbox mail: the same on every try, so a mail sent again after its
 * sender died between the server's acceptance and the "sent" mark (the at-least-once edge
 * of the outbox) is the same message to the reader's mail program, which shows it once
 * (RFC 5322 §3.6.4: a Message-ID names one message; a resend of it carries the same one).
 */
export function outboxMessageId(outboxId: number): string {
  const domain = /@([^>\s]+)>?\s*$/.exec(mailFrom())?.[1] ?? "localhost";
  return `<beadline-outbox-${outboxId}@${domain}>`;
}

/** A transport for the given SMTP server (defaults from the environment). */
export function createSmtpTransport({ host = process.env.SMTP_HOST || "127.0.0.1", port = Number(process.env.SMTP_PORT || 2525) }: { host?: string; port?: number } = {}): MailTransport {
  const secure = process.env.SMTP_SECURE === "true";
  const transporter: Transporter = nodemailer.createTransport({
    host,
    port,
    secure,
    // The local fake offers no STARTTLS; a real relay sets SMTP_SECURE or requires TLS itself.
    ignoreTLS: !secure && process.env.SMTP_REQUIRE_TLS !== "true",
    requireTLS: process.env.SMTP_REQUIRE_TLS === "true",
    auth: process.env.SMTP_USER ? { user: process.env.SMTP_USER, pass: process.env.SMTP_PASSWORD ?? "" } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 15_000,
  });
  return {
    send: async ({ to, subject, text, messageId }) => {
      await transporter.sendMail({ from: mailFrom(), to, subject, text, ...(messageId ? { messageId } : {}) });
    },
    close: () => transporter.close(),
  };
}
