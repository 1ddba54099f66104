// Local fake SMTP server for development and tests: accepts every message on loopback and
// keeps it as a JSON file in a spool folder (read by the admin mailbox page and by tests).
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { SMTPServer } from "smtp-server";

export type LocalMailServer = { port: number; spoolDir: string; stop: () => Promise<void> };

export async function startLocalMailServer({ port, spoolDir }: { port: number; spoolDir: string }): Promise<LocalMailServer> {
  mkdirSync(spoolDir, { recursive: true });
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
        writeFileSync(path.join(spoolDir, name), JSON.stringify(message));
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
