// Structured logs (pino, JSON lines on stdout). Every line written while handling a request
// carries its request id: the guards create one per request (or take the caller's
// x-request-id) and log through `requestLogger(requestId)`.
// Secrets never reach a log line, in two layers: pino's redact list removes passwords,
// cookies and session values wherever they appear as fields of a logged object, and the
// final line is scrubbed of the secret values this process knows (session secret, database
// and object-store passwords) and of anything shaped like a sealed session cookie.
import pino, { type Logger } from "pino";

const REDACT_PATHS = [
  "password",
  "*.password",
  "*.*.password",
  "newPassword",
  "*.newPassword",
  "passwordHash",
  "*.passwordHash",
  "*.*.passwordHash",
  "password_hash",
  "*.password_hash",
  "cookie",
  "*.cookie",
  "headers.cookie",
  "*.headers.cookie",
  "req.headers.cookie",
  "set-cookie",
  "*.set-cookie",
  "*.headers.set-cookie",
  "sessionSecret",
  "*.sessionSecret",
  "authorization",
  "*.authorization",
  "*.headers.authorization",
];

/** Secret values of this process that must never be printed, whatever field they hide in. */
function knownSecrets(): string[] {
  const values: string[] = [];
  const add = (v: string | undefined) => {
    if (v && v.length >= 6) values.push(v);
  };
  add(process.env.SESSION_SECRET);
  add(process.env.S3_SECRET_ACCESS_KEY === "S3RVER" ? undefined : process.env.S3_SECRET_ACCESS_KEY);
  for (const name of ["DATABASE_URL", "MIGRATION_DATABASE_URL"]) {
    const url = process.env[name];
    if (!url) continue;
    try {
      add(decodeURIComponent(new URL(url).password));
      add(new URL(url).password);
    } catch {
      /* not a URL: nothing to add */
    }
  }
  return values;
}

const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/**
 * Removes secrets from one serialised log line: known secret values, iron-session seals
 * ("Fe26.2*…"), session cookie values, bcrypt hashes and `"password":"…"` pairs the redact
 * paths did not reach (deeper nesting).
 */
export function scrubLogLine(line: string): string {
  let out = line;
  for (const secret of knownSecrets()) {
    out = out.replace(new RegExp(escapeRegExp(secret), "g"), "[redacted]");
    const json = JSON.stringify(secret).slice(1, -1);
    if (json !== secret) out = out.replace(new RegExp(escapeRegExp(json), "g"), "[redacted]");
  }
  return out
    .replace(/Fe26\.2\*[^"\s;,]*/g, "[redacted]")
    .replace(/(beadline_session=)[^"\s;,]*/g, "$1[redacted]")
    .replace(/\$2[aby]\$\d\d\$[./A-Za-z0-9]{53}/g, "[redacted]")
    .replace(/("(?:password|newPassword|passwordHash|password_hash|secret|sessionSecret)"\s*:\s*)"(?:[^"\\]|\\.)*"/gi, '$1"[redacted]"');
}

type Sink = (line: string) => void;
const sinks = new Set<Sink>();

/** Where lines go: stdout, or the capturing sinks of a test. */
const destination = {
  write(line: string): void {
    if (sinks.size) for (const sink of sinks) sink(line);
    else process.stdout.write(line);
  },
};

function defaultLevel(): string {
  return process.env.LOG_LEVEL || (process.env.NODE_ENV === "test" ? "silent" : "info");
}

export const logger: Logger = pino(
  {
    level: defaultLevel(),
    base: { app: "beadline" },
    timestamp: pino.stdTimeFunctions.isoTime,
    redact: { paths: REDACT_PATHS, censor: "[redacted]" },
    hooks: { streamWrite: scrubLogLine },
  },
  destination,
);

/** The logger for one request: every line it writes carries `requestId`. */
export function requestLogger(requestId: string, bindings: Record<string, unknown> = {}): Logger {
  return logger.child({ requestId, ...bindings });
}

/**
 * For tests: collects every line written (at `level`, default debug) until `stop()`.
 * Lines are the final, scrubbed JSON strings exactly as they would reach stdout.
 */
export function captureLogs(level = "debug"): { lines: string[]; records: () => Record<string, unknown>[]; stop: () => void } {
  const lines: string[] = [];
  const sink: Sink = (line) => lines.push(line);
  const previous = logger.level;
  sinks.add(sink);
  logger.level = level;
  return {
    lines,
    records: () => lines.flatMap((l) => l.split("\n").filter(Boolean)).map((l) => JSON.parse(l) as Record<string, unknown>),
    stop: () => {
      sinks.delete(sink);
      if (!sinks.size) logger.level = previous;
    },
  };
}
