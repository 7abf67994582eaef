import path from "node:path";
import fs from "node:fs";
import { startObjectStore } from "./object-store";

const port = Number(process.env.OBJECT_STORE_PORT ?? 4569);
const dir = path.join(process.env.TENTHWISE_SERVICES_DIR ?? ".data", "objects");
fs.mkdirSync(dir, { recursive: true });
const store = await startObjectStore({ port, directory: dir, bucket: process.env.S3_BUCKET ?? "tenthwise" });
process.stdout.write(`object store: ${store.endpoint}\n`);
const stop = () => void store.close().then(() => process.exit(0));
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
