import { useState } from "react";
import { Link } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { createColumnHelper } from "@tanstack/react-table";
import { useReminderRun, useReminderRuns, useRunRemindersNow } from "../api/reminders";
import { PageHeader, Card, ErrorNote, Loading } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { Button, ButtonLink } from "../../../components/ui/button";
import { api, errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { cx } from "../../../components/ui/cx";
import { RoleNotice } from "../../../components/ui/role-notice";
import { useCan, useRoleName } from "../../auth/api/auth";
import { formatInstant } from "../../../lib/format";
import { stageLabel } from "../../../../shared/reminders/reminder-plan";
import type { ReminderRun, RunRemindersResult } from "../../../../shared/reminders/reminders.schemas";
import type { Settings } from "../../../../shared/settings/settings.schemas";
import { describeCron } from "../../../../shared/settings/cron-words";
import { ScrollBox } from "../../../components/ui/scroll-box";

const lowerFirst = (s: string) => s.charAt(0).toLowerCase() + s.slice(1);

const STATUS: Record<ReminderRun["status"], { label: string; cls: string }> = {
  running: { label: "Running", cls: "bg-caution-light text-caution border-caution/40" },
  finished: { label: "Finished", cls: "bg-go-light text-go border-go/40" },
  failed: { label: "Failed", cls: "bg-stop-light text-stop border-stop/40" },
  skipped_locked: { label: "Skipped: another run was sending", cls: "bg-paper-sunk text-ink-soft border-paper-line" },
};
/** Who started a run: the person who pressed "Run reminders now", else the schedule or the shell command. */
const TRIGGER: Record<ReminderRun["trigger"], string> = { schedule: "Schedule", manual: "A person (no longer on record)", cli: "Shell command (npm run job:reminders)", setup: "First start (demo set-up)" };
const startedBy = (r: ReminderRun) => (r.trigger === "manual" && r.startedBy ? r.startedBy : TRIGGER[r.trigger]);

function RunStatus({ run }: { run: Pick<ReminderRun, "status" | "failed"> }) {
  const s = run.status === "finished" && run.failed > 0 ? { label: "Finished with failures", cls: STATUS.failed.cls } : STATUS[run.status];
  return <span className={cx("inline-flex whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold", s.cls)}>{s.label}</span>;
}

function resultSentence(r: RunRemindersResult): string {
  if (r.status === "skipped_locked") return "Another run was already sending reminders, so this one sent nothing. Nothing is sent twice.";
  const mails = `${r.sent} e-mail${r.sent === 1 ? "" : "s"} sent`;
  const earlier = r.skipped ? `; ${r.skipped} reminder${r.skipped === 1 ? " was" : "s were"} already sent by an earlier run` : "";
  const failed = r.failed ? `; ${r.failed} could not be sent and will be tried again by the next run` : "";
  return `${mails}${earlier}${failed}.`;
}

const col = createColumnHelper<ReminderRun>();

/** The runs of the reminder job; only a role that may run reminders sees them (the server keeps them to that role too). */
export function ReminderRunsPage() {
  const canRun = useCan("reminders.run");
  const roleName = useRoleName();
  if (!canRun) {
    return (
      <div>
        <PageHeader title="Reminders" subtitle="Due-date reminders: coming due, overdue and not returned, each sent once." />
        <RoleNotice roleName={roleName}>
          cannot see the reminder runs or send reminders; an administrator runs them. Your own reminders are set in <Link className="underline" to="/me/notifications">My notifications</Link>.
        </RoleNotice>
      </div>
    );
  }
  return <ReminderRuns />;
}

function ReminderRuns() {
  const list = useListParams([] as const);
  const runs = useReminderRuns(list.page);
  const runNow = useRunRemindersNow();
  const settings = useQuery({ queryKey: ["settings"], queryFn: () => api.get<Settings>("/api/settings"), staleTime: 60_000 });
  const [openId, setOpenId] = useState<string | null>(null);

  const columns = [
    col.accessor("startedAt", { header: "Started", cell: (c) => <span className="whitespace-nowrap">{formatInstant(c.getValue())}</span> }),
    col.accessor("trigger", { header: "By", cell: (c) => startedBy(c.row.original) }),
    col.accessor("status", { header: "Result", cell: (c) => <RunStatus run={c.row.original} /> }),
    col.accessor("sent", { header: "E-mails sent" }),
    col.accessor("failed", { header: "E-mails failed", cell: (c) => <span className={c.getValue() ? "font-semibold text-stop" : undefined}>{c.getValue()}</span> }),
    col.accessor("skipped", { header: "Already sent earlier" }),
    col.accessor("error", { header: "Note", cell: (c) => <span className="text-ink-soft">{c.getValue() ?? ""}</span> }),
    col.display({
      id: "open",
      header: "Details",
      cell: (c) => (
        <Button variant="ghost" aria-label={`Details of the run started ${formatInstant(c.row.original.startedAt)}`} onClick={() => setOpenId(c.row.original.id)}>
          Details
        </Button>
      ),
    }),
  ];

  return (
    <div>
      <PageHeader
        title="Reminders"
        subtitle={
          settings.data
            ? `Due-date reminders go out ${lowerFirst(describeCron(settings.data.reminderCron))} (${settings.data.shopTimeZone} time), ${settings.data.reminderStages.join(", ")} days before due, when overdue, and for tools not returned. Each reminder is sent once.`
            : "Due-date reminders: coming due, overdue and not returned, each sent once."
        }
        actions={
          <>
            <Button onClick={() => runNow.mutate()} disabled={runNow.isPending}>
              {runNow.isPending ? "Running…" : "Run reminders now"}
            </Button>
            <ButtonLink to="/admin/outbox">Outbox</ButtonLink>
            <ButtonLink to="/admin/settings">Schedule and stages</ButtonLink>
          </>
        }
      />
      {runNow.isSuccess && (
        <p role="status" className="mb-4 rounded-md border border-go/40 bg-go-light px-3 py-2 text-sm text-go">
          {resultSentence(runNow.data)}
        </p>
      )}
      {runNow.isError && <ErrorNote>{errorMessage(runNow.error)}</ErrorNote>}
      {runs.isError && <ErrorNote>{errorMessage(runs.error)}</ErrorNote>}
      <DataTable
        label="Reminder runs"
        columns={columns}
        {...pagedProps(runs, list, 20)}
        rowKey={(r) => r.id}
        empty={<p className="text-center text-ink-faint">No runs yet. The first scheduled run, or "Run reminders now", will appear here.</p>}
        initialHidden={["error"]}
      />
      {openId && <RunDetail id={openId} onClose={() => setOpenId(null)} />}
    </div>
  );
}

function RunDetail({ id, onClose }: { id: string; onClose: () => void }) {
  const run = useReminderRun(id);
  const r = run.data;
  return (
    <Card
      className="mt-5"
      title={r ? `Run of ${formatInstant(r.startedAt)}` : "Run"}
      actions={
        <Button variant="ghost" onClick={onClose}>
          Close
        </Button>
      }
    >
      {run.isPending && <Loading />}
      {run.isError && <ErrorNote>{errorMessage(run.error)}</ErrorNote>}
      {r && (
        <>
          <p className="mb-3 text-sm">
            <RunStatus run={r} /> {r.error && <span className="ml-2 text-ink-soft">{r.error}</span>}
          </p>
          {r.entries.length === 0 ? (
            <p className="text-ink-faint">This run claimed no reminders: nothing new was due.</p>
          ) : (
            <ScrollBox label="Reminders of this run">
              <table className="w-full text-left text-sm" aria-label="Reminders of this run">
                <thead className="bg-paper-sunk text-xs uppercase tracking-wide text-ink-soft">
                  <tr>
                    {["To", "Tool", "Reminder", "Due", "Outcome", "Tries", "Mail server said"].map((h) => (
                      <th key={h} scope="col" className="px-3 py-2">
                        {h}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {r.entries.map((e, i) => (
                    <tr key={i} className="border-t border-paper-line">
                      <td className="px-3 py-2">
                        {e.recipientName}
                        <br />
                        <span className="text-xs text-ink-faint">{e.recipientEmail}</span>
                      </td>
                      <td className="px-3 py-2">
                        <Link className="font-semibold underline" to={`/tools/${encodeURIComponent(e.assetTag)}`}>
                          {e.assetTag}
                        </Link>
                      </td>
                      <td className="px-3 py-2">{stageLabel(e.stage)}</td>
                      <td className="whitespace-nowrap px-3 py-2">{e.dueAt}</td>
                      <td className={cx("px-3 py-2 font-semibold", e.status === "failed" ? "text-stop" : e.status === "sent" ? "text-go" : "text-caution")}>
                        {e.status === "sent" ? "Sent" : e.status === "failed" ? "Failed" : "Claimed, not sent"}
                      </td>
                      <td className="px-3 py-2">{e.attempts}</td>
                      <td className="px-3 py-2 text-xs text-ink-soft">{e.lastError ?? ""}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollBox>
          )}
        </>
      )}
    </Card>
  );
}
