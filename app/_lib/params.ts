// Path-parameter schemas for defineRoute({ params }). Our ids are positive whole numbers
// (MariaDB BIGINT UNSIGNED AUTO_INCREMENT, at most 15 digits here so they stay exact in a
// JavaScript number); anything else in the `[id]` segment is refused by the wrapper.
import { z } from "zod";

/** `{ id }` from an `[id]` segment; `message` is what a malformed id answers. */
export function idParams(message: string) {
  return z.object({
    id: z
      .string({ error: message })
      .regex(/^\d{1,15}$/, { error: message })
      .transform(Number)
      .pipe(z.number().int().positive({ error: message })),
  });
}
