// Structured logs (pino, JSON lines on stdout). Every line written while handling a request
// carries its request id: the guards create one per request (or take the caller's
// x-request-id) and log through `requestLogger(requestId)`.
// Secrets never reach a log line, in two layers: pino's redact list removes passwords,
// cookies and session values wherever they appear as fields of a logged object, and the
// final line is scrubbed of the secret values this process knows (session secret, database
// and object-store passwords) and of anything shaped like a sealed session cookie.
import { isMainThread } from "node:worker_threads";
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
 * One regular expression for every known secret, as written and as JSON escapes it. Built
 * once per set of values (the environment does not change while the server runs; a test
 * that changes it gets a new one), not for every line.
 */
let secretsPattern: { from: string; pattern: RegExp | null } | null = null;

function secretsRegExp(): RegExp | null {
  const env = process.env;
  const from = [env.SESSION_SECRET, env.S3_SECRET_ACCESS_KEY, env.DATABASE_URL, env.MIGRATION_DATABASE_URL].join("\n");
  if (secretsPattern?.from === from) return secretsPattern.pattern;
  const forms = new Set<string>();
  for (const secret of knownSecrets()) {
    forms.add(secret);
    forms.add(JSON.stringify(secret).slice(1, -1));
  }
  // Longest first, so a secret that contains another is removed whole.
  const alternatives = [...forms].sort((a, b) => b.length - a.length).map(escapeRegExp);
  const pattern = alternatives.length ? new RegExp(alternatives.join("|"), "g") : null;
  secretsPattern = { from, pattern };
  return pattern;
}

/**
 * Removes secrets from one serialised log line: known secret values, iron-session seals
 * ("Fe26.2*…"), session cookie values, bcrypt hashes and `"password":"…"` pairs the redact
 * paths did not reach (deeper nesting).
 */
export function scrubLogLine(line: string): string {
  const secrets = secretsRegExp();
  const out = secrets ? line.replace(secrets, "[redacted]") : line;
  return out
    .replace(/Fe26\.2\*[^"\s;,]*/g, "[redacted]")
    .replace(/(beadline_session=)[^"\s;,]*/g, "$1[redacted]")
    .replace(/\$2[aby]\$\d\d\$[./A-Za-z0-9]{53}/g, "[redacted]")
    .replace(/("(?:password|newPassword|passwordHash|password_hash|secret|sessionSecret)"\s*:\s*)"(?:[^"\\]|\\.)*"/gi, '$1"[redacted]"');
}

type Sink = (line: string) => void;
const sinks = new Set<Sink>();

/**
 * Standard output without blocking the request: pino's asynchronous destination (sonic-boom
 * on fd 1) queues each line and writes it while the server goes on; pino flushes what is
 * still queued when the process exits. Made on the first line, in the main thread only (a
 * worker thread's stdout already goes through the main thread).
 */
let stdout: { write(line: string): void; flush?(cb?: (err?: Error) => void): void } | null = null;

function stdoutDestination() {
  stdout ??= isMainThread ? pino.destination({ dest: 1, sync: false }) : { write: (line: string) => void process.stdout.write(line) };
  return stdout;
}

/** Where lines go: stdout, or the capturing sinks of a test. */
const destination = {
  write(line: string): void {
    if (sinks.size) for (const sink of sinks) sink(line);
    else stdoutDestination().write(line);
  },
  flush(cb?: (err?: Error) => void): void {
    if (stdout?.flush) stdout.flush(cb);
    else cb?.();
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
