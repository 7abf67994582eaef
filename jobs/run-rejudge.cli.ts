// `npm run job:rejudge`: judges every stored reading not yet judged under the current judging rules, then exits —
// the same pass a server runs soon after it starts. Safe beside a running server: it only adds verdict rows.
import { loadConfig } from "../server/config";
import { createDb } from "../server/db/client";
import { systemClock } from "../server/platform/clock";
import { judgeStoredReadings } from "../server/modules/readings/reading-judgements.service";

let config;
try {
  config = loadConfig(process.env);
} catch (e) {
  process.stderr.write(`${(e as Error).message}\n`);
  process.stderr.write("Set DATABASE_URL as for the server; for the `npm start` database: postgres://app:<.data/pg-password>@127.0.0.1:54329/tenthwise\n");
  process.exit(2);
}
const { pool, db } = createDb(config.DATABASE_URL, 3);
let code = 0;
try {
  const { judged, changed } = await judgeStoredReadings({ db, clock: systemClock });
  process.stdout.write(`${judged} reading(s) judged under the current rules; ${changed} of them judged otherwise than recorded.\n`);
} catch (e) {
  process.stderr.write(`Re-judging failed: ${(e as Error).message}\n`);
  code = 1;
} finally {
  await pool.end();
}
process.exit(code);
