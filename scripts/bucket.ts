import fs from "node:fs";
import path from "node:path";
import { startObjectStore } from "../server/dev-services/object-store";
import type { BucketOptions } from "../server/platform/backup";

/**
 * The bucket named by S3_* variables, or — for the npm start data folder, when no S3_ENDPOINT is set —
 * the local object store's folder served for the time of the call on a free port.
 */
export async function withBucket<T>(work: (bucket: BucketOptions) => Promise<T>): Promise<T> {
  const bucket: BucketOptions = {
    endpoint: process.env.S3_ENDPOINT,
    bucket: process.env.S3_BUCKET ?? "tenthwise",
    region: process.env.S3_REGION ?? "us-east-1",
    accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER",
    secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER",
  };
  if (bucket.endpoint) return work(bucket);
  const dir = path.join(process.env.TENTHWISE_SERVICES_DIR ?? ".data", "objects");
  fs.mkdirSync(dir, { recursive: true });
  const store = await startObjectStore({ port: 0, directory: dir, bucket: bucket.bucket });
  try {
    return await work({ ...bucket, endpoint: store.endpoint });
  } finally {
    await store.close();
  }
}
