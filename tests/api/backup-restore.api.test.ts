import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import pg from "pg";
import request from "supertest";
import { pino } from "pino";
import { S3Client, ListObjectsV2Command, GetObjectCommand } from "@aws-sdk/client-s3";
import { clusterUrl, createTestDatabase, type TestDatabase } from "../support/test-db";
import { stateDigest } from "../support/state-digest";
import { startObjectStore } from "../../server/dev-services/object-store";
import { s3Storage } from "../../server/platform/storage";
import { restore } from "../../server/platform/backup";
import { seedDemoOnce } from "../../server/seed";
import { loadConfig } from "../../server/config";
import { fixedClock } from "../../server/platform/clock";
import { createDb } from "../../server/db/client";
import { createApp } from "../../server/app";
import { memoryMailer } from "../support/test-app";
import { RUNTIME_ROLE, withCredentials } from "../../server/db/roles";

// npm run backup writes one archive (database and stored files) and prints its path last; npm run
// restore puts the shop back exactly: every row of every table and every stored file, byte for byte.

const run = promisify(execFile);
let database: TestDatabase;
let store: Awaited<ReturnType<typeof startObjectStore>>;
let dir: string;
const restoredName = () => `${database.name}_restored`;
const S3 = { region: "us-east-1", accessKeyId: "S3RVER", secretAccessKey: "S3RVER" };

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "tw-backup-test-"));
  store = await startObjectStore({ port: 0, directory: path.join(dir, "objects"), bucket: "tenthwise" });
  database = await createTestDatabase();
  const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: database.url, SESSION_SECRET: "backup-test-session-secret", LOG_LEVEL: "silent", CRON_ENABLED: "false" });
  const storage = s3Storage({ endpoint: store.endpoint, bucket: "tenthwise", ...S3 });
  await seedDemoOnce({ db: database.db, clock: fixedClock("2026-06-15T15:00:00Z"), config, mailer: memoryMailer(), storage }, "tenthwise-demo");
}, 120_000);

afterAll(async () => {
  const admin = new pg.Client({ connectionString: clusterUrl("postgres") });
  await admin.connect();
  await admin.query(`drop database if exists "${restoredName()}" with (force)`);
  await admin.end();
  await database?.drop();
  await store?.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

async function bucketContents(bucket: string) {
  const client = new S3Client({ endpoint: store.endpoint, forcePathStyle: true, region: S3.region, credentials: { accessKeyId: S3.accessKeyId, secretAccessKey: S3.secretAccessKey } });
  const out = new Map<string, string>();
  const listed = await client.send(new ListObjectsV2Command({ Bucket: bucket }));
  for (const o of listed.Contents ?? []) {
    const got = await client.send(new GetObjectCommand({ Bucket: bucket, Key: o.Key! }));
    out.set(o.Key!, Buffer.from(await got.Body!.transformToByteArray()).toString("base64"));
  }
  return out;
}

describe("backup and restore", () => {
  it("a seeded shop is backed up to one archive and restored with every row and every stored file", async () => {
    const { stdout } = await run("npx", ["tsx", "scripts/backup.ts"], {
      env: { ...process.env, DATABASE_OWNER_URL: database.ownerUrl, S3_ENDPOINT: store.endpoint, S3_BUCKET: "tenthwise", TENTHWISE_BACKUP_DIR: path.join(dir, "backups") },
    });
    const archive = stdout.trim().split("\n").pop()!;
    expect(archive).toMatch(/tenthwise-backup-.*\.tar\.gz$/);
    expect(fs.statSync(archive).size).toBeGreaterThan(1000);

    const files = await bucketContents("tenthwise");
    expect(files.size).toBeGreaterThan(3);
    const result = await restore({ archive, adminUrl: clusterUrl("postgres"), database: restoredName(), bucket: { endpoint: store.endpoint, bucket: "restored", ...S3 } });
    expect(result.files).toBe(files.size);

    // Every table, row for row (read as the app's role, as the app will).
    const restored = createDb(withCredentials(clusterUrl(restoredName()), RUNTIME_ROLE), 2);
    try {
      const original = await stateDigest(database.db);
      expect(Object.keys(original).length).toBeGreaterThan(30);
      expect(await stateDigest(restored.db)).toEqual(original);
      // Every stored file, byte for byte, under the same key.
      expect(await bucketContents("restored")).toEqual(files);
      // The restored database is one the app runs on: the demo sign-in works and evidence is still protected.
      const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: "postgres://restored", SESSION_SECRET: "backup-test-session-secret", LOG_LEVEL: "silent", CRON_ENABLED: "false" });
      const app = createApp({ db: restored.db, pool: restored.pool, config, clock: fixedClock("2026-06-15T15:00:00Z"), mailer: memoryMailer(), storage: s3Storage({ endpoint: store.endpoint, bucket: "restored", ...S3 }), logger: pino({ level: "silent" }), clientDir: "/nonexistent" });
      const a = request.agent(app);
      const token = (await a.get("/api/auth/csrf")).body.token;
      const login = await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: "quality@tenthwise.test", password: "tenthwise-demo" });
      expect(login.status).toBe(200);
      const refused = await restored.pool.query("delete from audit_events").catch((e: { code: string }) => e.code);
      expect(refused).toBe("P0001");
    } finally {
      await restored.pool.end();
    }
  });
});
