import cron from "node-cron";
import type { AppDeps } from "../server/app-deps";
import { judgeStoredReadings } from "../server/modules/readings/reading-judgements.service";

/**
 * Judges stored readings under the current judging rules: once soon after start (readings recorded under earlier rules,
 * e.g. after an upgrade), then hourly as a sweep. New readings are judged when recorded; this only finds what is left.
 * Idempotent and safe beside other instances: it adds verdict rows and never changes a reading.
 */
export function startReadingRejudging(deps: AppDeps) {
  const run = async () => {
    try {
      const { judged, changed } = await judgeStoredReadings(deps);
      if (judged) deps.logger.info({ judged, changed }, "readings judged under the current rules");
    } catch (err) {
      deps.logger.warn({ err }, "re-judging readings failed; the next sweep tries again");
    }
  };
  const first = setTimeout(() => void run(), 5_000);
  const task = cron.schedule("17 * * * *", run, { name: "reading-rejudging", noOverlap: true });
  return {
    stop: () => {
      clearTimeout(first);
      void task.stop();
    },
  };
}
