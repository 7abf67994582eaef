import type { SeedContext } from "./seed-context";
import { runReminders } from "../modules/reminders/reminders.service";

/**
 * Runs the reminder job once over the seeded shop, so the outbox holds real
 * demo mail on first start (under `npm start` ctx.mailer sends to the local
 * mail catcher). The run is logged like any other, so the admin's list of runs
 * starts with it, and the next scheduled run sends nothing twice.
 */
export async function seedReminders(ctx: SeedContext): Promise<void> {
  const result = await runReminders(
    {
      db: ctx.db,
      clock: ctx.clock,
      mailer: ctx.mailer,
      config: ctx.config,
      // A missing mail catcher should not hold the first start for long; the scheduled run retries.
      retry: { attempts: 2, backoffMs: () => 500, sleep: (ms) => new Promise((r) => setTimeout(r, ms)) },
    },
    { trigger: "setup" },
  );
  ctx.shared.reminderRun = result;
}
