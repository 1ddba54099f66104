// Path-parameter schemas for defineRoute({ params }). Our ids are positive whole numbers in
// their column's range (domain/form-fields ID_MAX: INT UNSIGNED, or BIGINT UNSIGNED as far as
// a JavaScript number is exact), written in plain digits; anything else in the `[id]` segment
// (hex, exponent, sign, 400 nines) is refused by the wrapper before any query.
import { z } from "zod";
import { requiredId, type IdColumn } from "@/domain/form-fields";

/** `{ id }` from an `[id]` segment; `message` is what a malformed id answers; `column` the id column's kind (INT UNSIGNED tables say "int"). */
export function idParams(message: string, column: IdColumn = "bigint") {
  return z.object({ id: requiredId(message, column) });
}
