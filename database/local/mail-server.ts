// Local fake SMTP server for development and tests: accepts every message on loopback and
// keeps it as a JSON file in a spool folder (read by the admin mailbox page and by tests).
// The spool is private to the launcher's user: folder 0700, messages 0600.
import { chmodSync, mkdirSync, renameSync, writeFileSync } from "node:fs";
import path from "node:path";
import { SMTPServer } from "smtp-server";

export type LocalMailServer = { port: number; spoolDir: string; stop: () => Promise<void> };

export async function startLocalMailServer({ port, spoolDir }: { port: number; spoolDir: string }): Promise<LocalMailServer> {
  mkdirSync(spoolDir, { recursive: true, mode: 0o700 });
  chmodSync(spoolDir, 0o700);
  let counter = 0;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        const raw = Buffer.concat(chunks).toString("utf8");
        counter += 1;
        const name = `${Date.now()}-${process.pid}-${counter}.json`;
        const message = {
          receivedAt: new Date().toISOString(),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
          to: session.envelope.rcptTo.map((r) => r.address),
          raw,
        };
        // Whole or not at all: written under a dot name (the mailbox skips those), then renamed.
        const temporary = path.join(spoolDir, `.${name}.tmp`);
        writeFileSync(temporary, JSON.stringify(message), { mode: 0o600 });
        renameSync(temporary, path.join(spoolDir, name));
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => resolve());
  });
  return { port, spoolDir, stop: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}
