// Empties the test database and loads the demo scenario (run by tests/run.ts before the browser tests).
import { closeOwnerDb, resetDatabase, seedDemo } from "./db";

void (async () => {
  await resetDatabase();
  await seedDemo();
  await closeOwnerDb();
})().catch((error) => {
  console.error(error);
  process.exit(1);
});
