import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { createDb } from "./client";

const here = path.dirname(fileURLToPath(import.meta.url));

/** Folder of the drizzle-kit migrations, from the source tree or from the built server. */
export function migrationsFolder(): string {
  const candidates = [path.resolve(here, "../../drizzle"), path.resolve(here, "../drizzle"), path.resolve(process.cwd(), "drizzle")];
  return candidates.find((c) => fs.existsSync(path.join(c, "meta/_journal.json"))) ?? candidates[2];
}

/** Applies every pending migration from drizzle/. */
export async function runMigrations(url: string): Promise<void> {
  // A migration may rewrite a large table: no statement or lock time limit here.
  const { pool, db } = createDb(url, { max: 1, statementTimeoutMs: 0, lockTimeoutMs: 0, idleInTransactionMs: 0, applicationName: "tenthwise-migrate" });
  try {
    await migrate(db, { migrationsFolder: migrationsFolder() });
  } finally {
    await pool.end();
  }
}
