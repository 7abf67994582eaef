import path from "node:path";
import fs from "node:fs";
import { startObjectStore } from "./object-store";
import { tieToParent } from "./tie-to-parent";

const port = Number(process.env.OBJECT_STORE_PORT ?? 0);
const dir = path.join(process.env.TENTHWISE_SERVICES_DIR ?? ".data", "objects");
fs.mkdirSync(dir, { recursive: true });
const store = await startObjectStore({ port, directory: dir, bucket: process.env.S3_BUCKET ?? "tenthwise" });
process.stdout.write(`object store: ${store.endpoint}\n`);
tieToParent({ http: store.port }, () => store.close());
