// The one result shape every server action returns, and the error codes shared with the
// JSON API's error shape `{ error: { code, message, fields? } }`.

export type ErrorCode = "bad-request" | "unauthenticated" | "forbidden" | "not-found" | "invalid" | "conflict" | "too-large" | "unsupported-type" | "throttled" | "unavailable" | "internal";

export const STATUS_FOR_CODE: Record<ErrorCode, number> = {
  "bad-request": 400,
  unauthenticated: 401,
  forbidden: 403,
  "not-found": 404,
  conflict: 409,
  "too-large": 413,
  "unsupported-type": 415,
  invalid: 422,
  throttled: 429,
  unavailable: 503,
  internal: 500,
};

/** Per-field messages: every failing field, not only the first. */
export type FieldErrors = Record<string, string[]>;

export type ActionSuccess<T> = { ok: true; data: T };
export type ActionFailure = { ok: false; status: number; code: ErrorCode; message: string; fields?: FieldErrors };
export type ActionResult<T> = ActionSuccess<T> | ActionFailure;

/** Thrown by domain-level use cases to fail with a code; the wrappers turn it into a result. */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldErrors,
  ) {
    super(message);
    this.name = "AppError";
  }
}

export function failure(code: ErrorCode, message: string, fields?: FieldErrors): ActionFailure {
  return { ok: false, status: STATUS_FOR_CODE[code], code, message, ...(fields ? { fields } : {}) };
}

/** Turns zod issues into per-field messages (path joined with dots; form-level under "_form"). */
export function fieldErrorsFromIssues(issues: readonly { path: readonly PropertyKey[]; message: string }[]): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of issues) {
    const key = issue.path.length ? issue.path.map(String).join(".") : "_form";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/**
 * A short sentence naming every failing field, for the aria-live region and the API message.
 * Fields are named by `labels` (the words the form shows beside them); a field without a
 * label is not named at all — its own message, which names it in words, says which — so an
 * internal name ("heaterMin", "manufacturerCode") never reaches a person.
 */
export function describeFieldErrors(fields: FieldErrors, labels: Readonly<Record<string, string>> = {}): string {
  const names = Object.keys(fields).filter((k) => k !== "_form");
  const form = fields._form?.join(" ") ?? "";
  if (!names.length) return form || "The input is not valid.";
  const messages = [...new Set(names.map((n) => fields[n][0]))].join(" ");
  const labelled = names.map((n) => labels[n]).filter((label): label is string => Boolean(label));
  const head = labelled.length === names.length ? `Check ${labelled.join(", ")}` : names.length === 1 ? "Check this field" : `Check these ${names.length} fields`;
  return `${head}: ${messages}${form ? " " + form : ""}`;
}
