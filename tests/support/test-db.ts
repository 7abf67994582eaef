import { randomBytes } from "node:crypto";
import pg from "pg";
import { createDb } from "../../server/db/client";

function base() {
  const url = process.env.TEST_PG_URL;
  if (!url) throw new Error("TEST_PG_URL is not set: run the tests with `npm test`, which starts a throwaway PostgreSQL.");
  return url;
}

/**
 * A fresh database for one test file, cloned from the migrated template
 * (CREATE DATABASE … TEMPLATE is a file copy: fast, and every file starts clean).
 */
export async function createTestDatabase() {
  const name = `t_${Date.now().toString(36)}_${randomBytes(3).toString("hex")}`;
  const admin = new pg.Client({ connectionString: `${base()}/postgres` });
  await admin.connect();
  await admin.query(`create database "${name}" template "${process.env.TEST_TEMPLATE_DB ?? "tenthwise_template"}"`);
  await admin.end();
  const url = `${base()}/${name}`;
  const { pool, db } = createDb(url, 5);
  // Dropping the database at the end of a file ends idle pooled connections
  // (57P01); that is expected, not a failure.
  pool.on("error", (e: Error & { code?: string }) => {
    if (e.code !== "57P01") throw e;
  });
  return {
    url,
    name,
    pool,
    db,
    async drop() {
      await pool.end();
      const c = new pg.Client({ connectionString: `${base()}/postgres` });
      await c.connect();
      await c.query(`drop database if exists "${name}" with (force)`);
      await c.end();
    },
  };
}
export type TestDatabase = Awaited<ReturnType<typeof createTestDatabase>>;
