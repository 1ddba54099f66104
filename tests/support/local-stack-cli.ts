// Starts the local stack (database/local/stack.ts) in a given directory on free ports, prints
// "stack ready" and stops it again; on failure prints the launcher's one-line message and exits 1.
// Used by tests/database/stack-start.test.ts to watch a first start fail and the next succeed.
//   tsx tests/support/local-stack-cli.ts <dir> [--fault provision-sql] [--hold]
import { startLocalStack, type StackFault } from "../../database/local/stack";
import { failureLine } from "../../database/local/redact";

async function main(): Promise<number> {
  const [dir, ...rest] = process.argv.slice(2);
  if (!dir) {
    console.error("usage: local-stack-cli.ts <dir> [--fault provision-sql] [--hold]");
    return 2;
  }
  const faultAt = rest.indexOf("--fault");
  const fault = faultAt >= 0 ? (rest[faultAt + 1] as StackFault) : undefined;
  try {
    const stack = await startLocalStack({ dir, ports: "free", fault });
    console.log(`stack ready: ${JSON.stringify({ dbPort: new URL(stack.env.DATABASE_URL).port, s3: stack.env.S3_ENDPOINT })}`);
    if (rest.includes("--hold")) await new Promise<void>((resolve) => process.once("SIGTERM", () => resolve()));
    await stack.stop();
    return 0;
  } catch (error) {
    console.error(`[beadline] ${failureLine(error)}`);
    return 1;
  }
}

void main().then((code) => process.exit(code));
