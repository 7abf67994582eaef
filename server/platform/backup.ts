import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import pg from "pg";
import { S3Client, ListObjectsV2Command, GetObjectCommand, PutObjectCommand, HeadBucketCommand, CreateBucketCommand } from "@aws-sdk/client-s3";
import { OWNER_ROLE, prepareDatabase, withCredentials } from "../db/roles";

const run = promisify(execFile);

/** Where the stored files live (the local object store or a real bucket). */
export interface BucketOptions {
  endpoint?: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
}

interface ObjectEntry {
  key: string;
  file: string;
  contentType: string;
  size: number;
  sha256: string;
}

interface Manifest {
  format: "tenthwise-backup";
  version: 1;
  createdAt: string;
  database: string;
  rows: Record<string, number>;
  objects: ObjectEntry[];
}

/** The PostgreSQL client programs of the newest installed version (Debian's layout), or PG_BIN. */
export function pgBin(tool: "pg_dump" | "pg_restore"): string {
  if (process.env.PG_BIN) return path.join(process.env.PG_BIN, tool);
  const root = "/usr/lib/postgresql";
  const versions = fs.existsSync(root) ? fs.readdirSync(root).filter((v) => /^\d+$/.test(v)).sort((a, b) => Number(a) - Number(b)) : [];
  const dir = versions.length ? path.join(root, versions[versions.length - 1], "bin") : "";
  return dir && fs.existsSync(path.join(dir, tool)) ? path.join(dir, tool) : tool;
}

function s3(opts: BucketOptions) {
  return new S3Client({ endpoint: opts.endpoint, region: opts.region, forcePathStyle: true, credentials: { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey } });
}

/** Row counts of every table, for the manifest and for a restore to check against. */
async function rowCounts(url: string): Promise<Record<string, number>> {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    const tables = (await c.query("select tablename from pg_tables where schemaname = 'public' order by tablename")).rows.map((r) => String(r.tablename));
    const out: Record<string, number> = {};
    for (const t of tables) out[t] = Number((await c.query(`select count(*)::int as n from "${t}"`)).rows[0].n);
    return out;
  } finally {
    await c.end();
  }
}

/**
 * Writes one archive (tar.gz) holding the database (pg_dump custom format, taken in one snapshot) and
 * every stored file of the bucket, with a manifest of row counts and file checksums. Returns its path.
 */
export async function backup(opts: { ownerUrl: string; bucket: BucketOptions; outDir: string; now?: Date }): Promise<string> {
  const stamp = (opts.now ?? new Date()).toISOString().replace(/[:.]/g, "-");
  const work = fs.mkdtempSync(path.join(os.tmpdir(), "tenthwise-backup-"));
  try {
    const database = decodeURIComponent(new URL(opts.ownerUrl).pathname.slice(1));
    await run(pgBin("pg_dump"), ["--format=custom", "--no-owner", "--no-privileges", `--file=${path.join(work, "database.dump")}`, `--dbname=${opts.ownerUrl}`], { maxBuffer: 64 * 1024 * 1024 });
    const rows = await rowCounts(opts.ownerUrl);

    const client = s3(opts.bucket);
    const objects: ObjectEntry[] = [];
    fs.mkdirSync(path.join(work, "objects"));
    let token: string | undefined;
    do {
      const page = await client.send(new ListObjectsV2Command({ Bucket: opts.bucket.bucket, ContinuationToken: token }));
      for (const o of page.Contents ?? []) {
        const got = await client.send(new GetObjectCommand({ Bucket: opts.bucket.bucket, Key: o.Key! }));
        const body = Buffer.from(await got.Body!.transformToByteArray());
        const file = `objects/${String(objects.length).padStart(6, "0")}`;
        fs.writeFileSync(path.join(work, file), body);
        objects.push({ key: o.Key!, file, contentType: got.ContentType ?? "application/octet-stream", size: body.length, sha256: createHash("sha256").update(body).digest("hex") });
      }
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);

    const manifest: Manifest = { format: "tenthwise-backup", version: 1, createdAt: new Date().toISOString(), database, rows, objects };
    fs.writeFileSync(path.join(work, "manifest.json"), JSON.stringify(manifest, null, 2));
    fs.mkdirSync(opts.outDir, { recursive: true });
    const archive = path.resolve(opts.outDir, `tenthwise-backup-${stamp}.tar.gz`);
    await run("tar", ["-czf", archive, "-C", work, "manifest.json", "database.dump", "objects"]);
    return archive;
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }
}

/**
 * Restores an archive: the database is dropped and created again from the dump (as the owner, then the
 * roles' grants and any newer migrations applied), every stored file is written back to the bucket, and
 * row counts and checksums are checked against the manifest. A running app reconnects on its own.
 */
export async function restore(opts: { archive: string; adminUrl: string; database: string; ownerPassword?: string; runtimePassword?: string; bucket: BucketOptions }) {
  const work = fs.mkdtempSync(path.join(os.tmpdir(), "tenthwise-restore-"));
  try {
    await run("tar", ["-xzf", path.resolve(opts.archive), "-C", work]);
    const manifest = JSON.parse(fs.readFileSync(path.join(work, "manifest.json"), "utf8")) as Manifest;
    if (manifest.format !== "tenthwise-backup") throw new Error(`${opts.archive} is not a Tenthwise backup`);

    const admin = new pg.Client({ connectionString: withCredentials(opts.adminUrl, decodeURIComponent(new URL(opts.adminUrl).username), decodeURIComponent(new URL(opts.adminUrl).password), "postgres") });
    await admin.connect();
    try {
      await admin.query(`drop database if exists "${opts.database.replace(/"/g, '""')}" with (force)`);
    } finally {
      await admin.end();
    }
    // Roles and an empty database owned by the owner; the dump brings tables, data, triggers and the migration journal.
    const { ownerUrl } = await prepareDatabase({ adminUrl: opts.adminUrl, database: opts.database, ownerPassword: opts.ownerPassword, runtimePassword: opts.runtimePassword, migrate: false });
    await run(pgBin("pg_restore"), ["--no-owner", "--no-privileges", `--role=${OWNER_ROLE}`, "--exit-on-error", `--dbname=${ownerUrl}`, path.join(work, "database.dump")], { maxBuffer: 64 * 1024 * 1024 });
    // Grants and ownership again (the dump carries none), and migrations newer than the backup.
    await prepareDatabase({ adminUrl: opts.adminUrl, database: opts.database, ownerPassword: opts.ownerPassword, runtimePassword: opts.runtimePassword });

    const restored = await rowCounts(ownerUrl);
    for (const [table, n] of Object.entries(manifest.rows)) {
      if (restored[table] !== n) throw new Error(`restore check: ${table} has ${restored[table]} rows, the backup had ${n}`);
    }

    const client = s3(opts.bucket);
    await client.send(new HeadBucketCommand({ Bucket: opts.bucket.bucket })).catch(() => client.send(new CreateBucketCommand({ Bucket: opts.bucket.bucket })));
    for (const o of manifest.objects) {
      const body = fs.readFileSync(path.join(work, o.file));
      if (createHash("sha256").update(body).digest("hex") !== o.sha256) throw new Error(`restore check: stored file ${o.key} is damaged in the archive`);
      await client.send(new PutObjectCommand({ Bucket: opts.bucket.bucket, Key: o.key, Body: body, ContentType: o.contentType }));
    }
    return { tables: Object.keys(manifest.rows).length, rows: Object.values(manifest.rows).reduce((a, b) => a + b, 0), files: manifest.objects.length };
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }
}
