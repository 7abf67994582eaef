import path from "node:path";
import { startMailCatcher } from "./mail-catcher";

const smtpPort = Number(process.env.MAIL_CATCHER_SMTP_PORT ?? 2525);
const httpPort = Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 2526);
const dir = process.env.TENTHWISE_SERVICES_DIR ?? ".data";

const catcher = await startMailCatcher({ smtpPort, httpPort, storeFile: path.join(dir, "mail.jsonl") });
process.stdout.write(`mail catcher: smtp 127.0.0.1:${catcher.smtpPort}, http 127.0.0.1:${catcher.httpPort}\n`);
const stop = () => void catcher.close().then(() => process.exit(0));
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
