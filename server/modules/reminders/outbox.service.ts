import { AppError, notFound, refused } from "../../http/errors";
import type { OutboxMessage, OutboxMessageDetail } from "../../../shared/reminders/reminders.schemas";
import type { CaughtMessage } from "../../dev-services/mail-catcher";


// The outbox exists only where mail goes to the local catcher (npm start, tests);
// with a real mail service the messages are in that service, not here.
async function caught(catcherUrl: string | undefined): Promise<(CaughtMessage & { id: number })[]> {
  if (!catcherUrl) {
    throw refused(
      "outbox_unavailable",
      "There is no outbox here: this server sends mail to a real mail service (SMTP_URL). The outbox shows mail caught by the local mail catcher, which `npm start` runs and names in MAIL_CATCHER_URL.",
    );
  }
  let res: Response;
  try {
    res = await fetch(`${catcherUrl.replace(/\/+$/, "")}/messages`, { signal: AbortSignal.timeout(5000) });
  } catch {
    throw new AppError("outbox_unreachable", 502, `The local mail catcher at ${catcherUrl} did not answer; is it running?`);
  }
  if (!res.ok) throw new AppError("outbox_unreachable", 502, `The local mail catcher at ${catcherUrl} answered ${res.status}.`);
  const messages = (await res.json()) as CaughtMessage[];
  return messages.map((m, id) => ({ ...m, id }));
}

const summary = (m: CaughtMessage & { id: number }): OutboxMessage => ({ id: m.id, to: m.to.join(", "), subject: m.subject, sentAt: m.sentAt });

/** Mail the local catcher holds, newest first (api.md: `[{ to, subject, sentAt }]`). */
export async function listOutbox(catcherUrl: string | undefined): Promise<OutboxMessage[]> {
  return (await caught(catcherUrl)).reverse().map(summary);
}

/** One caught message with its text and HTML. */
export async function outboxMessage(catcherUrl: string | undefined, id: number): Promise<OutboxMessageDetail> {
  const m = (await caught(catcherUrl))[id];
  if (!m) throw notFound("message", id);
  return { ...summary(m), from: m.from, text: m.text, html: m.html };
}
