import cron from "node-cron";
import type { AppDeps } from "../server/app-deps";
import { deliverPendingNotices } from "../server/modules/investigations/investigations.notify";

/**
 * Every minute, sends investigation notices still pending: the ones a crash or
 * a mail outage left behind after their investigation committed. Notices are
 * claimed exactly once, so this never doubles the immediate send.
 */
export function startInvestigationNoticeSweep(deps: AppDeps) {
  const task = cron.schedule(
    "* * * * *",
    async () => {
      try {
        await deliverPendingNotices(deps.db, deps.mailer, deps.clock);
      } catch (err) {
        deps.logger.warn({ err }, "investigation notices: sweep failed; will try again next minute");
      }
    },
    { name: "investigation-notices", noOverlap: true },
  );
  return { stop: () => void task.stop() };
}
