// The refusal when a record changed under an edit (optimistic locking on its version),
// one wording for jobs, people, machines and heater plates.
import "server-only";

export const CONFLICT_MESSAGE = (what: string) => `${what} was changed by someone else while you were editing; reload the page to see the latest and make your change again.`;
