import path from "node:path";
import { backup } from "../server/platform/backup";
import { withBucket } from "./bucket";

// npm run backup: one archive with the database and every stored file; its path is the last line printed.
const ownerUrl = process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL;
if (!ownerUrl) {
  process.stderr.write("Set DATABASE_OWNER_URL (the owner role's URL) — `npm run backup` sets it for the npm start data folder.\n");
  process.exit(2);
}
try {
  const file = await withBucket((bucket) => backup({ ownerUrl, bucket, outDir: process.env.TENTHWISE_BACKUP_DIR ?? path.resolve("backups") }));
  process.stdout.write(`${file}\n`);
} catch (e) {
  process.stderr.write(`backup failed: ${(e as Error).message}\n`);
  process.exit(1);
}
