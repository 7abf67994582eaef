import cron from "node-cron";
import type { AppDeps } from "../server/app-deps";
import { deliverPendingNotices } from "../server/modules/investigations/investigations.notify";
import { gatherPendingInvestigations } from "../server/modules/investigations/investigations.service";

/**
 * Every minute, gathers the affected readings of investigations still gathering
 * (a crash or a lost connection left them behind after their opening committed;
 * each is held while it is gathered, so this never doubles the gathering that
 * follows an opening), then sends investigation notices still pending: the ones
 * a crash or a mail outage left behind. Notices are claimed exactly once, so
 * this never doubles the immediate send.
 */
export function startInvestigationNoticeSweep(deps: AppDeps) {
  const task = cron.schedule(
    "* * * * *",
    async () => {
      try {
        await gatherPendingInvestigations(deps.db, deps);
        await deliverPendingNotices(deps.db, deps.mailer, deps.clock);
      } catch (err) {
        deps.logger.warn({ err }, "investigation notices: sweep failed; will try again next minute");
      }
    },
    { name: "investigation-notices", noOverlap: true },
  );
  return { stop: () => void task.stop() };
}
