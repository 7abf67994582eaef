import type { DbOrTx } from "../../db/client";
import { notFound } from "../../http/errors";
import { remindersRepository as repo, type ReminderRunRow } from "./reminders.repository";
import type { ReminderRun, ReminderRunDetail } from "../../../shared/reminders/reminders.schemas";
import type { Page } from "../../../shared/common/lists.schemas";

const toRun = ({ run: r, startedByName }: { run: ReminderRunRow; startedByName: string | null }): ReminderRun => ({
  id: r.id,
  trigger: r.trigger,
  startedBy: startedByName,
  startedAt: r.startedAt.toISOString(),
  finishedAt: r.finishedAt?.toISOString() ?? null,
  status: r.status,
  sent: r.sent,
  skipped: r.skipped,
  failed: r.failed,
  error: r.error,
});

/** Runs of the reminder job, newest first. */
export async function listReminderRuns(db: DbOrTx, page: number, pageSize: number): Promise<Page<ReminderRun>> {
  const { items, total } = await repo.listRuns(db, page, pageSize);
  return { items: items.map(toRun), total };
}

/** One run with every reminder it claimed and what became of each (a failure names its SMTP error). */
export async function reminderRunDetail(db: DbOrTx, id: string): Promise<ReminderRunDetail> {
  const run = await repo.findRun(db, id);
  if (!run) throw notFound("reminder run", id);
  const entries = await repo.entriesOfRun(db, id);
  return { ...toRun(run), entries: entries.map((e) => ({ ...e, sentAt: e.sentAt?.toISOString() ?? null })) };
}
