import { useEffect, useState } from "react";
import { useOutbox, useOutboxMessage } from "../api/reminders";
import { PageHeader, EmptyState, ErrorNote, Loading, Facts } from "../../../components/ui/layout";
import { Button, ButtonLink } from "../../../components/ui/button";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { cx } from "../../../components/ui/cx";
import { formatInstant } from "../../../lib/format";
import { ScrollBox } from "../../../components/ui/scroll-box";

export function OutboxPage() {
  const outbox = useOutbox();
  const [openId, setOpenId] = useState<number | null>(null);
  const unavailable = outbox.error instanceof ApiError && outbox.error.code === "outbox_unavailable";

  return (
    <div>
      <PageHeader
        title="Outbox"
        subtitle="Mail Tenthwise sent, as caught by the local mail service of this demo installation. With a real mail service, the messages are in that service instead."
        actions={
          <>
            <Button variant="secondary" onClick={() => void outbox.refetch()} disabled={outbox.isFetching}>
              Refresh
            </Button>
            <ButtonLink to="/admin/reminders">Reminder runs</ButtonLink>
          </>
        }
      />
      {outbox.isPending && <Loading what="Reading the outbox" />}
      {outbox.isError && (unavailable ? <EmptyState>{errorMessage(outbox.error)}</EmptyState> : <ErrorNote>{errorMessage(outbox.error)}</ErrorNote>)}
      {outbox.data && outbox.data.length === 0 && <EmptyState>No mail yet. Run the reminders from the Reminders page to send the digests due today.</EmptyState>}
      {outbox.data && outbox.data.length > 0 && (
        <>
          <ScrollBox label="Outbox" className="rounded-card border border-paper-line bg-paper-raised shadow-card">
            <table className="w-full text-left text-sm" aria-label="Outbox">
              <thead className="bg-paper-sunk text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th scope="col" className="px-3 py-2">Sent at</th>
                  <th scope="col" className="px-3 py-2">To</th>
                  <th scope="col" className="px-3 py-2">Subject</th>
                  <th scope="col" className="px-3 py-2"><span className="sr-only">Open</span></th>
                </tr>
              </thead>
              <tbody>
                {outbox.data.map((m) => (
                  <tr key={m.id} className={cx("border-t border-paper-line", openId === m.id ? "bg-brass-light/40" : "hover:bg-paper")}>
                    <td className="whitespace-nowrap px-3 py-2 align-top">{formatInstant(m.sentAt)}</td>
                    <td className="px-3 py-2 align-top [overflow-wrap:anywhere] md:whitespace-nowrap">{m.to}</td>
                    <td className="px-3 py-2 align-top">{m.subject}</td>
                    <td className="px-3 py-2 align-top">
                      <Button variant="ghost" aria-label={`Open the message to ${m.to}: ${m.subject}`} aria-pressed={openId === m.id} onClick={() => setOpenId(m.id)}>
                        Open
                      </Button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollBox>
          {openId !== null && <MessageView id={openId} onClose={() => setOpenId(null)} />}
        </>
      )}
    </div>
  );
}

/** The opened message in a panel over the page: beside the list on a desk screen, the whole screen on a phone. */
function MessageView({ id, onClose }: { id: number; onClose: () => void }) {
  const message = useOutboxMessage(id);
  const [asHtml, setAsHtml] = useState(false);
  const m = message.data;
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => e.key === "Escape" && onClose();
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [onClose]);
  return (
    <div className="fixed inset-0 z-30 flex justify-end bg-ink/40" onClick={onClose}>
      <div
        role="dialog"
        aria-modal="true"
        aria-label="Message"
        className="flex h-full w-full max-w-2xl flex-col overflow-y-auto bg-paper-raised p-4 shadow-card sm:p-6"
        onClick={(e) => e.stopPropagation()}
      >
        <div className="mb-3 flex items-center justify-between gap-2">
          <h2 className="text-lg font-semibold">Message</h2>
          <div className="flex gap-2">
            {m?.html && (
              <Button variant="secondary" onClick={() => setAsHtml((v) => !v)}>
                {asHtml ? "Show text" : "Show as HTML"}
              </Button>
            )}
            <Button variant="secondary" onClick={onClose} autoFocus>
              Close
            </Button>
          </div>
        </div>
        {message.isPending && <Loading what="Opening the message" />}
        {message.isError && <ErrorNote>{errorMessage(message.error)}</ErrorNote>}
        {m && (
          <article aria-label={`Message: ${m.subject}`} className="flex min-h-0 flex-1 flex-col">
            <Facts items={[["From", m.from], ["To", m.to], ["Sent at", formatInstant(m.sentAt)], ["Subject", m.subject]]} />
            {asHtml && m.html ? (
              <iframe title="Message as HTML" sandbox="" srcDoc={m.html} className="mt-3 min-h-[32rem] w-full flex-1 rounded-md border border-paper-line bg-white" />
            ) : (
              <pre className="mt-3 whitespace-pre-wrap break-words rounded-md bg-paper-sunk p-3 font-mono text-xs leading-relaxed">{m.text}</pre>
            )}
          </article>
        )}
      </div>
    </div>
  );
}
