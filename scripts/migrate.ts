import { runMigrations } from "../server/db/migrate";
import { prepareDatabase } from "../server/db/roles";

// Two ways: DATABASE_ADMIN_URL (a superuser of the cluster) and DATABASE_NAME provision the roles and
// the database, then migrate as the owner (npm test, the quick test runner); or DATABASE_OWNER_URL /
// DATABASE_URL alone migrates a database whose roles someone else set up.
const adminUrl = process.env.DATABASE_ADMIN_URL;
const name = process.env.DATABASE_NAME;
try {
  if (adminUrl && name) {
    await prepareDatabase({ adminUrl, database: name, ownerPassword: process.env.DATABASE_OWNER_PASSWORD, runtimePassword: process.env.DATABASE_RUNTIME_PASSWORD });
  } else {
    const url = process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL;
    if (!url) throw new Error("Set DATABASE_ADMIN_URL and DATABASE_NAME, or DATABASE_OWNER_URL (or DATABASE_URL).");
    await runMigrations(url);
  }
} catch (e) {
  process.stderr.write(`${(e as Error).message}\n`);
  process.exit(1);
}
