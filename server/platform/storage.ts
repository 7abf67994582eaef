import { S3Client, PutObjectCommand, GetObjectCommand } from "@aws-sdk/client-s3";
import { randomUUID } from "node:crypto";

/** Where certificates and photos are kept. */
export interface ObjectStorage {
  put(prefix: string, body: Buffer, contentType: string, fileName?: string): Promise<string>;
  get(key: string): Promise<{ body: Buffer; contentType: string }>;
}

/** S3-compatible storage (the local fake in development and tests, a real bucket in production). */
export function s3Storage(opts: { endpoint?: string; bucket: string; region: string; accessKeyId: string; secretAccessKey: string }): ObjectStorage {
  const client = new S3Client({
    endpoint: opts.endpoint,
    region: opts.region,
    forcePathStyle: true,
    credentials: { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey },
  });
  return {
    async put(prefix, body, contentType, fileName) {
      const safe = (fileName ?? "file").replace(/[^A-Za-z0-9._-]+/g, "_").slice(-80);
      const key = `${prefix}/${randomUUID()}-${safe}`;
      await client.send(new PutObjectCommand({ Bucket: opts.bucket, Key: key, Body: body, ContentType: contentType }));
      return key;
    },
    async get(key) {
      const out = await client.send(new GetObjectCommand({ Bucket: opts.bucket, Key: key }));
      const bytes = await out.Body!.transformToByteArray();
      return { body: Buffer.from(bytes), contentType: out.ContentType ?? "application/octet-stream" };
    },
  };
}
