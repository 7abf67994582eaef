import { randomBytes } from "node:crypto";
import pg from "pg";
import { createDb } from "../../server/db/client";
import { OWNER_ROLE, RUNTIME_ROLE, withCredentials } from "../../server/db/roles";

/** The cluster's superuser URL (no database), as `npm test` and scripts/test-quick.sh export it. */
export function adminBase() {
  const url = process.env.TEST_PG_URL;
  if (!url) throw new Error("TEST_PG_URL is not set: run the tests with `npm test`, which starts a throwaway PostgreSQL.");
  return url;
}

/** A URL of the test cluster as the superuser, the owner or the runtime role (trust authentication). */
export function clusterUrl(database: string, as: "admin" | "owner" | "runtime" = "admin") {
  const admin = `${adminBase()}/${database}`;
  return as === "admin" ? admin : withCredentials(admin, as === "owner" ? OWNER_ROLE : RUNTIME_ROLE);
}

/**
 * A fresh database for one test file, cloned from the migrated template (CREATE DATABASE … TEMPLATE is a
 * file copy: fast, and every file starts clean). The app's pool connects as the runtime role, as in
 * production: what the tests do, the app may do, and nothing more.
 */
export async function createTestDatabase(opts: { max?: number } = {}) {
  const name = `t_${Date.now().toString(36)}_${randomBytes(3).toString("hex")}`;
  const admin = new pg.Client({ connectionString: clusterUrl("postgres") });
  await admin.connect();
  await admin.query(`create database "${name}" owner ${OWNER_ROLE} template "${process.env.TEST_TEMPLATE_DB ?? "tenthwise_template"}"`);
  await admin.end();
  const url = clusterUrl(name, "runtime");
  const { pool, db } = createDb(url, {
    max: opts.max ?? 5,
    // Dropping the database at the end of a file ends idle pooled connections (57P01); that is expected.
    onConnectionError: (e: Error & { code?: string }) => {
      if (e.code !== "57P01") console.error("test database connection error", e);
    },
  });
  return {
    url,
    name,
    ownerUrl: clusterUrl(name, "owner"),
    adminUrl: clusterUrl(name, "admin"),
    pool,
    db,
    async drop() {
      await pool.end();
      const c = new pg.Client({ connectionString: clusterUrl("postgres") });
      await c.connect();
      await c.query(`drop database if exists "${name}" with (force)`);
      await c.end();
    },
  };
}
export type TestDatabase = Awaited<ReturnType<typeof createTestDatabase>>;
