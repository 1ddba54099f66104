// Loads the demo scenario into the throw-away database before the browser tests.
import { closeOwnerDb, resetDatabase, seedDemo } from "../support/db";

export default async function globalSetup(): Promise<void> {
  await resetDatabase();
  await seedDemo();
  await closeOwnerDb();
}
