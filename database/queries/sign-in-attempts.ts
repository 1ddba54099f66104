// Sign-in throttling counters. Kept in MariaDB (not process memory) so several web
// instances share them.
import { conn, type Db } from "../client";

export async function insertSignInAttempt({ email, address, succeeded }: { email: string; address: string; succeeded: boolean }, trx?: Db): Promise<void> {
  await conn(trx)("sign_in_attempts").insert({ email: email.toLowerCase().slice(0, 254), address: address.slice(0, 64), succeeded });
}

/** Failures since `since` for the account and for the address (each counted separately). */
export async function countRecentFailures(
  { email, address, since }: { email: string; address: string; since: Date },
  trx?: Db,
): Promise<{ byEmail: number; byAddress: number }> {
  const k = conn(trx);
  const [e, a] = await Promise.all([
    k("sign_in_attempts").where({ email: email.toLowerCase(), succeeded: false }).where("attempted_at", ">=", since).count({ n: "*" }).first(),
    k("sign_in_attempts").where({ address, succeeded: false }).where("attempted_at", ">=", since).count({ n: "*" }).first(),
  ]);
  return { byEmail: Number(e?.n ?? 0), byAddress: Number(a?.n ?? 0) };
}
