// Structured logs (pino, JSON lines). Secrets never reach a log line: the redact list
// covers passwords, cookies and session values wherever they appear in a logged object.
import pino from "pino";

export const logger = pino({
  level: process.env.LOG_LEVEL || (process.env.NODE_ENV === "test" ? "silent" : "info"),
  base: { app: "beadline" },
  redact: {
    paths: [
      "password",
      "*.password",
      "*.*.password",
      "passwordHash",
      "*.passwordHash",
      "cookie",
      "*.cookie",
      "headers.cookie",
      "*.headers.cookie",
      "req.headers.cookie",
      "set-cookie",
      "*.set-cookie",
      "sessionSecret",
      "*.sessionSecret",
      "authorization",
      "*.authorization",
    ],
    censor: "[redacted]",
  },
});
