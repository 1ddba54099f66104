// What `npm run bench` (tests/bench/run.ts) hands to further bench steps, e.g.
// tests/bench/load.ts's `runLoadBench(ctx)`, and the shape of one figure of the table.
import type { Knex } from "knex";
import type { SyntheticRegister } from "./synthetic-register";

export type BenchFigure = {
  /** What was measured, e.g. "register p95, whole register, first page". */
  figure: string;
  value: number | string;
  unit?: string;
  /** The target in words, e.g. "< 50 ms". */
  target?: string;
  /** null when the figure has no target (shown for information). */
  pass: boolean | null;
  note?: string;
  /** The row of issue #18's Targets table this figure decides (TARGET_ROWS in tests/bench/targets.ts), if any. */
  targetRow?: string;
};

export type BenchContext = {
  /** http://127.0.0.1:<port> of the `next start` under test. */
  baseUrl: string;
  /** Process id of the web server (for /proc/<pid>/status RSS readings). */
  serverPid: number;
  /** The environment the server runs with (DATABASE_URL, MIGRATION_DATABASE_URL, S3_*, SMTP_* …). */
  env: Record<string, string>;
  /** Owner connection to the bench database (full rights). */
  owner: Knex;
  /** Signs in through POST /api/v1/session and returns the Cookie header value. */
  signIn: (email: string, password: string) => Promise<string>;
  /** Password of every demo person (fixtures/demo-scenario.ts). */
  demoPassword: string;
  /** What the synthetic register holds (ids, lots, time range). */
  data: SyntheticRegister;
  /** Resident memory of the server now, MB. */
  serverRssMb: () => number;
  log: (line: string) => void;
};
