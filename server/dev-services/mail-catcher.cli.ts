import path from "node:path";
import { startMailCatcher } from "./mail-catcher";
import { tieToParent } from "./tie-to-parent";

// Port 0 asks the system for a free port; the ports bound are reported to the parent (npm start).
const smtpPort = Number(process.env.MAIL_CATCHER_SMTP_PORT ?? 0);
const httpPort = Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 0);
const dir = process.env.TENTHWISE_SERVICES_DIR ?? ".data";

const catcher = await startMailCatcher({ smtpPort, httpPort, storeFile: path.join(dir, "mail.jsonl") });
process.stdout.write(`mail catcher: smtp 127.0.0.1:${catcher.smtpPort}, http 127.0.0.1:${catcher.httpPort}\n`);
tieToParent({ smtp: catcher.smtpPort, http: catcher.httpPort! }, () => catcher.close());
