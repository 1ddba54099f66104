// The SMTP transport (nodemailer), configured from SMTP_HOST, SMTP_PORT and MAIL_FROM. In
// development and tests these point at the local fake server (database/local/mail-server.ts).
// Short timeouts: a mail server that hangs must not hold an outbox claim for long.
import "server-only";
import nodemailer, { type Transporter } from "nodemailer";

export type MailTransport = { send: (mail: { to: string; subject: string; text: string }) => Promise<void>; close: () => void };

export function mailFrom(): string {
  return process.env.MAIL_FROM || "Beadline <beadline@localhost>";
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
    send: async ({ to, subject, text }) => {
      await transporter.sendMail({ from: mailFrom(), to, subject, text });
    },
    close: () => transporter.close(),
  };
}
