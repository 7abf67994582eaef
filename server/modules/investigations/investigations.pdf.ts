import { newPdf, printedInstant } from "../../platform/pdf";
import { lengthWithUnit, signedLengthWithUnit } from "../../../shared/investigations/format";
import { DISPOSITION_LABELS, INVESTIGATION_CAUTIONS, INVESTIGATION_STATUS_LABELS, READING_VERDICT_LABELS, TRIGGER_LABELS, type InvestigationDetail, type InvestigationItem } from "../../../shared/investigations/investigations.schemas";

const when = (iso: string | null, tz: string) => (iso ? printedInstant(iso, tz, { seconds: true }) : "—");

const len = lengthWithUnit;
const signedLen = signedLengthWithUnit;

function itemTitle(i: InvestigationItem): string {
  if (i.kind === "calibration") return `Calibration of ${i.toolAssetTag ?? ""} on ${i.takenAt?.slice(0, 10) ?? ""}`;
  const job = i.job ? `Engine ${i.job.engineSerial}${i.job.workOrder ? ` (WO ${i.job.workOrder})` : ""}` : "";
  return `${job} — ${i.itemLabel ?? i.itemKey}${i.index && i.index > 1 ? ` #${i.index}` : ""} — tool ${i.toolAssetTag ?? ""}`;
}

/**
 * The investigation report: the finding, the window, every affected reading with its re-judged margins and
 * disposition, the closing summary, and the cautions (the flags prompt a qualified evaluation; they are not
 * determinations).
 */
export async function writeInvestigationPdf(inv: InvestigationDetail, pages: AsyncIterable<InvestigationItem[]>, printedAt: Date, tz: string): Promise<Buffer> {
  const { doc, done } = newPdf(`Investigation ${inv.toolAssetTag ?? ""}`, { margin: 48 });

  const heading = (text: string) => doc.moveDown(0.6).font("bold").fontSize(12).text(text).font("body").fontSize(9.5);
  const fact = (k: string, v: string) => doc.font("bold").text(`${k}: `, { continued: true }).font("body").text(v);

  doc.font("bold").fontSize(16).text(`Out-of-tolerance investigation — ${inv.toolAssetTag ?? ""}`);
  doc.font("body").fontSize(9).fillColor("#555").text(`Printed ${when(printedAt.toISOString(), tz)} (${tz}) by Tenthwise`).fillColor("black").fontSize(9.5);

  heading("Finding");
  fact("Trigger", TRIGGER_LABELS[inv.trigger]);
  if (inv.tool) fact("Tool", `${inv.tool.assetTag} — ${inv.tool.description}`);
  if (inv.standard) fact("Reference standard", `${inv.standard.assetTag} — ${inv.standard.name}`);
  doc.text(inv.finding.summary);
  if (inv.finding.errors) {
    const u = inv.finding.unit;
    doc.text(
      `Errors found: ${inv.finding.errors.map((e) => `${signedLen(e.error, u)} at ${len(e.nominal, u)}${e.mpe != null ? ` (permissible ±${len(e.mpe, u)})` : ""}${e.uncertainty ? ` U ${len(e.uncertainty, u)}` : ""}`).join("; ")}`,
    );
  } else doc.text("Errors found: unknown — every affected reading could have been judged differently.");
  if (inv.finding.note) fact("Note", inv.finding.note);
  fact("Opened", `${when(inv.openedAt, tz)}${inv.openedBy ? ` by ${inv.openedBy}` : ""}`);
  fact("Status", inv.status === "open" ? INVESTIGATION_STATUS_LABELS.open : `${INVESTIGATION_STATUS_LABELS.closed} ${when(inv.closedAt, tz)}${inv.closedBy ? ` by ${inv.closedBy}` : ""}`);
  if (inv.finding.notifications) {
    fact("Notified", inv.finding.notifications.recipients.map((r) => `${r.name} <${r.email}>`).join(", ") || "nobody");
  }

  heading("Window");
  fact("From", inv.windowStart ? when(inv.windowStart, tz) : "never known good — every reading before the finding");
  fact("To", when(inv.windowEnd, tz));
  doc.text(inv.finding.windowRule);

  heading(`Affected items (${inv.affectedCount}; ${inv.couldChangeCount} could have had a different verdict)`);
  if (inv.totals.items === 0) doc.text("No reading was taken with the tool in the window.");
  // Every item, read a page at a time (could-change first, then by check sheet and time), so a large investigation is
  // never held in memory at once.
  for await (const page of pages) for (const i of page) {
    if (doc.y > doc.page.height - 160) doc.addPage();
    doc.moveDown(0.4).font("bold").text(itemTitle(i));
    doc.font("body");
    const u = i.unit;
    const facts: string[] = [];
    if (i.kind === "reading") {
      if (i.values.length) facts.push(`Values ${i.values.map((v) => len(v, u)).join(" / ")}`);
      if (i.measuredValue != null) facts.push(`${i.quantity ?? "size"} ${len(i.measuredValue, u)}${i.bandLow != null && i.bandHigh != null ? ` (over the error band ${len(i.bandLow, u)} to ${len(i.bandHigh, u)})` : ""}`);
      facts.push(`verdict ${i.originalVerdict ? (READING_VERDICT_LABELS[i.originalVerdict as keyof typeof READING_VERDICT_LABELS] ?? i.originalVerdict).toLowerCase() : "—"}`);
      facts.push(`measured ${when(i.takenAt, tz)}${i.takenBy ? ` by ${i.takenBy}` : ""}`);
      if (i.override) facts.push("taken under an override");
    } else {
      facts.push(`result ${i.originalVerdict ?? "—"}; as-found error corrected ${signedLen(i.correctedValue, inv.tool?.unit ?? inv.standard?.unit ?? null)}`);
    }
    doc.text(facts.join("; "));
    doc.text(
      (i.kind === "reading"
        ? `Margin to the nearest limit: as read ${signedLen(i.marginBefore, u)}, at the worst of the error band ${signedLen(i.marginAfter, u)}; most likely ${i.quantity ?? "value"} ${len(i.correctedValue, u)}. `
        : `Margin to the nearest limit: before ${signedLen(i.marginBefore, u)}, after ${signedLen(i.marginAfter, u)}; corrected value ${len(i.correctedValue, u)}. `) +
        `Verdict could change: ${i.verdictCouldChange ? "YES" : "no"}.`,
    );
    doc.fontSize(8.5).fillColor("#333").text(i.basis).fillColor("black").fontSize(9.5);
    if (i.dispositions.length === 0) doc.fillColor("#a33").text("Disposition: none yet").fillColor("black");
    for (const d of i.dispositions) {
      const replaced = d.id !== i.disposition?.id;
      doc.text(
        `${replaced ? "Disposition (replaced by a later one)" : "Disposition"}: ${DISPOSITION_LABELS[d.kind]} — ${d.rationale} (${d.decidedBy.name}, ${when(d.decidedAt, tz)})` +
          (d.notifiedWhom ? `; notified ${d.notifiedWhom} by ${d.notifiedHow ?? "—"} at ${when(d.notifiedAt, tz)}` : "") +
          (d.remeasureReadingId ? `; remeasured as reading ${d.remeasureReadingId}` : ""),
      );
    }
  }

  if (inv.closingSummary) {
    heading("Closing summary");
    doc.text(inv.closingSummary);
  }

  heading("Cautions");
  for (const c of INVESTIGATION_CAUTIONS) doc.text(c);
  doc.end();
  return done;
}
