// A throw-away local stack with the demo scenario loaded, for the page measurements in
// tests/perf/ (page-cpu.ts, page-queries.ts): migrated, rights granted, every seed run, and
// the newest joint's id for the joint page. `stop()` takes it all down and removes the folder.
import "../support/server-only-outside-next";
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Knex } from "knex";
import { ensureMariadbInstalled } from "../../database/local/mariadb";
import { startLocalStack, type LocalStack } from "../../database/local/stack";
import { migrateLatest, ownerKnex } from "../../database/migrate";

const ROOT = path.resolve(__dirname, "..", "..");

export type DemoStack = { stack: LocalStack; owner: Knex; jointId: number; stop: () => Promise<void> };

export async function startDemoStack(prefix: string): Promise<DemoStack> {
  const tmp = mkdtempSync(path.join(os.tmpdir(), prefix));
  let stack: LocalStack | null = null;
  let owner: Knex | null = null;
  const stop = async () => {
    if (owner) await owner.destroy().catch(() => undefined);
    if (stack) await stack.stop();
    rmSync(tmp, { recursive: true, force: true });
  };
  try {
    ensureMariadbInstalled(console.log);
    process.env.BEADLINE_DB_BUFFER_POOL ||= "256M";
    stack = await startLocalStack({ dir: tmp, ports: "free" });
    await migrateLatest(stack.env.MIGRATION_DATABASE_URL);
    stack.grantRights();
    owner = ownerKnex(stack.env.MIGRATION_DATABASE_URL);
    for (const file of readdirSync(path.join(ROOT, "database", "seeds")).filter((f) => f.endsWith(".ts")).sort()) {
      const mod = (await import(path.join(ROOT, "database", "seeds", file))) as { seed: (k: Knex, today?: Date) => Promise<void> };
      await mod.seed(owner, new Date());
    }
    const [joint] = (await owner("joints").orderBy("id", "desc").limit(1).select("id")) as { id: number }[];
    return { stack, owner, jointId: Number(joint?.id), stop };
  } catch (error) {
    await stop();
    throw error;
  }
}
