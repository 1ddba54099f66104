// The one error type of the domain layer, and the house convention for failures.
//
// Convention (applies to every module in domain/):
// - Computations on numbers the caller has already validated (pipe geometry, pressure
//   plans, qualification dates, coil pulls) THROW a DomainError when the input is
//   impossible (SDR <= 2, OD <= 0, unknown size, a pull longer than the coil). These are
//   programming or validation mistakes, so a thrown error with a plain message is right.
// - Functions that judge text or an operator's choices (parseTraceCode,
//   parsePressureTraceCsv, readPressureTrace, deriveProcedure, parseProcedureDefinition)
//   RETURN a result `{ ok: true, ... } | { ok: false, ... }`, because a bad file or a
//   loosened window is an expected answer the screen must show, not an exception.

/** Machine-readable reason of a DomainError; the message is the plain-language text. */
export type DomainErrorCode =
  | 'invalid-input'
  | 'unknown-size'
  | 'unknown-standard'
  | 'outside-procedure-range'
  | 'outside-table';

export class DomainError extends Error {
  readonly code: DomainErrorCode;

  constructor(code: DomainErrorCode, message: string) {
    super(message);
    this.name = 'DomainError';
    this.code = code;
  }
}

/** Type guard for callers that catch errors from domain functions. */
export function isDomainError(error: unknown): error is DomainError {
  return error instanceof DomainError;
}
