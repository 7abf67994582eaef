import { restore } from "../server/platform/backup";
import { withBucket } from "./bucket";

// npm run restore -- FILE: the database and the stored files exactly as in the archive.
const archive = process.argv[2];
const adminUrl = process.env.DATABASE_ADMIN_URL;
if (!archive || !adminUrl) {
  process.stderr.write("Usage: npm run restore -- FILE   (DATABASE_ADMIN_URL: a superuser of the cluster; npm run restore sets it for the npm start data folder)\n");
  process.exit(2);
}
try {
  const r = await withBucket((bucket) =>
    restore({ archive, adminUrl, database: process.env.DATABASE_NAME ?? "tenthwise", ownerPassword: process.env.DATABASE_OWNER_PASSWORD, runtimePassword: process.env.DATABASE_RUNTIME_PASSWORD, bucket }),
  );
  process.stdout.write(`Restored ${r.rows} rows in ${r.tables} tables and ${r.files} stored files from ${archive}\n`);
} catch (e) {
  process.stderr.write(`restore failed: ${(e as Error).message}\n`);
  process.exit(1);
}
