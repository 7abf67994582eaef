// One app process as production runs it (startServer), for tests that need a process of its own: to
// kill it mid-work, or to run two side by side on one database sharing no memory. Configured by the
// environment like the server; prints "listening <url>" once it serves.
import { startServer } from "../../server/index";

const running = await startServer(process.env);
process.stdout.write(`listening ${running.url}\n`);
const stop = () => void running.stop().finally(() => process.exit(0));
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
