import type { OutgoingMail } from "../../platform/mailer";
import { stageLabel, type ReminderStage } from "../../../shared/reminders/reminder-plan";
import { DIGEST_INFO } from "../../../shared/reminders/reminders.schemas";
import { CAUTIONS } from "../../../shared/common/cautions";

/** One line of a digest: a tool and why it is in the mail. */
export interface DigestLine {
  stage: ReminderStage;
  assetTag: string;
  description: string;
  /** Calibration due date (shop calendar date), or null when no calibration counts. */
  dueAt: string | null;
  /** Why now, in words: "14 days overdue", "3 uses left of 50", "due back 15 Jun 17:00". */
  detail: string;
  where: string;
  who: string;
  link: string;
}

export interface Digest {
  recipient: { name: string; email: string };
  shopName: string;
  baseUrl: string;
  lines: DigestLine[];
}

// The same three sentences as the Cautions component (src/components/ui/cautions.tsx): a reminder judges a tool.

// Most urgent first.
function rank(stage: string): number {
  const fixed: Record<string, number> = { escalation: 0, overdue: 1, usage_limit: 2, not_returned: 3, usage_low: 100_000 };
  if (stage in fixed) return fixed[stage];
  const m = /^due_(\d+)$/.exec(stage);
  return m ? 10 + Number(m[1]) : 200_000;
}

function sections(lines: DigestLine[]) {
  const by = new Map<string, DigestLine[]>();
  for (const l of lines) {
    const list = by.get(l.stage);
    if (list) list.push(l);
    else by.set(l.stage, [l]);
  }
  return [...by.entries()]
    .sort(([a], [b]) => rank(a) - rank(b))
    .map(([stage, ls]) => ({ stage, title: stageLabel(stage), lines: ls.sort((a, b) => a.assetTag.localeCompare(b.assetTag)) }));
}

function subjectOf(d: Digest): string {
  const count = (pred: (s: string) => boolean) => new Set(d.lines.filter((l) => pred(l.stage)).map((l) => l.assetTag)).size;
  const parts = [
    [count((s) => s === "escalation"), "escalated"],
    [count((s) => s === "overdue" || s === "usage_limit"), "overdue"],
    [count((s) => s === "not_returned"), "not returned"],
    [count((s) => s.startsWith("due_") || s === "usage_low"), "coming due"],
  ]
    .filter(([n]) => (n as number) > 0)
    .map(([n, what]) => `${n} ${what}`);
  return `Tool calibration reminders: ${parts.join(", ")} (${d.shopName})`;
}

const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");

/** The e-mail for one recipient: every reminder of this run in one digest, plain text and HTML. */
export function renderDigest(d: Digest): OutgoingMail {
  const secs = sections(d.lines);
  const prefs = `${d.baseUrl}/me/notifications`;
  const text = [
    `Hello ${d.recipient.name},`,
    "",
    `These measuring tools at ${d.shopName} need attention. A tool may be used through its due date and is overdue from the next day; an overdue tool must not be used to measure.`,
    ...secs.flatMap((s) => [
      "",
      `== ${s.title} (${s.lines.length}) ==`,
      ...s.lines.flatMap((l) => [
        "",
        `${l.assetTag}  ${l.description}`,
        `  Due: ${l.dueAt ?? "no calibration on record"}${l.detail ? ` (${l.detail})` : ""}`,
        `  Where: ${l.where}`,
        `  Has it: ${l.who}`,
        `  ${l.link}`,
      ]),
    ]),
    "",
    "--",
    `Choose which reminders you receive: ${prefs} (${DIGEST_INFO.escalations.label.toLowerCase()} cannot be turned off).`,
    ...CAUTIONS,
  ].join("\n");

  const cell = "padding:4px 8px;border-bottom:1px solid #ddd;text-align:left;vertical-align:top";
  const html = [
    `<div style="font-family:'Noto Sans',Arial,sans-serif;color:#1d232b;max-width:720px">`,
    `<p>Hello ${esc(d.recipient.name)},</p>`,
    `<p>These measuring tools at ${esc(d.shopName)} need attention. A tool may be used through its due date and is overdue from the next day; an overdue tool must not be used to measure.</p>`,
    ...secs.map(
      (s) =>
        `<h2 style="font-size:16px;margin:18px 0 6px">${esc(s.title)} (${s.lines.length})</h2>` +
        `<table style="border-collapse:collapse;width:100%;font-size:14px"><thead><tr>` +
        ["Asset tag", "Description", "Due", "Where", "Has it"].map((h) => `<th style="${cell}">${h}</th>`).join("") +
        `</tr></thead><tbody>` +
        s.lines
          .map(
            (l) =>
              `<tr><td style="${cell};white-space:nowrap"><a href="${esc(l.link)}">${esc(l.assetTag)}</a></td><td style="${cell}">${esc(l.description)}</td>` +
              `<td style="${cell}"><span style="white-space:nowrap">${esc(l.dueAt ?? "no calibration on record")}</span>${l.detail ? `<br><small>${esc(l.detail)}</small>` : ""}</td>` +
              `<td style="${cell}">${esc(l.where)}</td><td style="${cell}">${esc(l.who)}</td></tr>`,
          )
          .join("") +
        `</tbody></table>`,
    ),
    `<p style="font-size:12px;color:#555;margin-top:18px">Choose which reminders you receive on <a href="${esc(prefs)}">your notification settings</a>; escalations cannot be turned off.</p>`,
    `<p style="font-size:12px;color:#555">${CAUTIONS.map(esc).join(" ")}</p>`,
    `</div>`,
  ].join("\n");

  return { to: d.recipient.email, subject: subjectOf(d), text, html };
}
