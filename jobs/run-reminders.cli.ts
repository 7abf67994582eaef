// `npm run job:reminders`: runs the due-reminder job once from a shell, with the
// same configuration (environment) and services as the server. Safe beside a
// running server: the run lock lets only one send, and nothing is sent twice.
import { pino } from "pino";
import { loadConfig } from "../server/config";
import { createDb } from "../server/db/client";
import { systemClock } from "../server/platform/clock";
import { smtpMailer } from "../server/platform/mailer";
import { sendDueReminders } from "./send-due-reminders.job";

let config;
try {
  config = loadConfig(process.env);
} catch (e) {
  process.stderr.write(`${(e as Error).message}\n`);
  process.stderr.write("Set DATABASE_URL (and SMTP_URL for a real mail service) as for the server; for the `npm start` database: postgres://tenthwise_app:<.data/app-password>@127.0.0.1:54329/tenthwise (the runtime role)\n");
  process.exit(2);
}
const logger = pino({ level: config.LOG_LEVEL });
const { pool, db } = createDb(config.DATABASE_URL, 3);
let code = 0;
try {
  const r = await sendDueReminders({ db, pool, clock: systemClock, mailer: smtpMailer(config.SMTP_URL, config.MAIL_FROM), config, logger }, "cli");
  if (r.status === "skipped_locked") {
    process.stdout.write("Another run is sending reminders right now; nothing was sent by this one.\n");
  } else {
    process.stdout.write(`Reminders: ${r.sent} e-mail(s) sent, ${r.failed} failed, ${r.skipped} reminder(s) already sent earlier.\n`);
    if (r.failed > 0) code = 1;
  }
} catch (e) {
  process.stderr.write(`The reminder run failed: ${(e as Error).message}\n`);
  code = 1;
} finally {
  await pool.end();
}
process.exit(code);
