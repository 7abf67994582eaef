import { formatLength, type LengthUnit } from "../../../shared/common/units";
import { formatClearance } from "../../../shared/inspection/sizes";
import { FLAG_LABELS, type ReadingFlag } from "../../../shared/readings/readings.schemas";
import { STATUS_LABELS, type ToolStatus } from "../../../shared/tools/tool-status";
import type { CheckSheet, SheetItem, SheetRow } from "../../../shared/jobs/jobs.schemas";
import { CAUTIONS } from "../../../shared/common/cautions";
import { newPdf, printedInstant } from "../../platform/pdf";

const when = printedInstant;

const COLS = [
  { key: "item", title: "Item", w: 118 },
  { key: "no", title: "No.", w: 22 },
  { key: "values", title: "Values", w: 92 },
  { key: "size", title: "Size / clearance", w: 86 },
  { key: "verdict", title: "Verdict", w: 88 },
  { key: "tools", title: "Tools", w: 62 },
  { key: "who", title: "Measured by", w: 62 },
] as const;

function rowCells(item: SheetItem, row: SheetRow, unit: LengthUnit, tz: string): Record<(typeof COLS)[number]["key"], string> {
  const r = row.reading;
  let values = "";
  let size = "";
  if (item.kind === "clearance") size = row.clearance == null ? "pending" : formatClearance(row.clearance, unit);
  else if (r) {
    if (r.values.length) values = `${r.values.map((v) => String(v)).join(" / ")} ${r.unit}`;
    if (r.size != null) size = `${formatLength(r.size, unit)} ${unit}${r.outOfRound != null ? `\nOOR ${formatLength(r.outOfRound, unit)}` : ""}`;
    if (r.correction) size += `\nat 20 °C ${formatLength(r.correction.correctedSize, unit)}`;
    if (r.goLeaf && r.noGoLeaf) values = `go ${r.goLeaf.label} ${r.goEntered ? "entered" : "did not enter"}; no-go ${r.noGoLeaf.label} ${r.noGoEntered ? "entered" : "did not enter"}`;
    if (r.visualResult) values = r.finding ?? "";
  }
  const flags = row.flags.map((f) => FLAG_LABELS[f as ReadingFlag] ?? f).join("; ");
  return {
    item: item.label,
    no: String(row.index),
    values,
    size,
    verdict: `${row.verdictText}${flags ? `\n! ${flags}` : ""}${r?.supersedeReason ? `\nCorrected: ${r.supersedeReason}` : ""}${r?.overrideReason ? `\nOverride: ${r.overrideReason}` : ""}`,
    tools: r ? r.tools.map((t) => t.assetTag).join("\n") : "",
    who: r ? `${r.takenBy?.name ?? ""}\n${when(r.takenAt, tz)}` : "",
  };
}

/** The check sheet as a printable PDF: items, values, sizes, clearances, verdicts, tools with due dates, who measured, who signed, cautions. */
export function writeCheckSheetPdf(sheet: CheckSheet, printedAt: Date, tz: string): Promise<Buffer> {
  const { doc, done } = newPdf(`Check sheet ${sheet.engineSerial}`, { margin: 36 });
  const unit = sheet.limitTable.unit;
  const left = doc.page.margins.left;
  const bottom = () => doc.page.height - doc.page.margins.bottom;

  doc.font("bold").fontSize(15).text(`Check sheet — ${sheet.engineModel}, serial ${sheet.engineSerial}`);
  doc.font("body").fontSize(9);
  if (sheet.limitTable.isDemo) {
    doc.fillColor("#8a4b00").font("bold").text("DEMO DATA — invented limits for the demonstration; use the manufacturer's current manual.").fillColor("black").font("body");
  }
  doc.text(`Work order: ${sheet.workOrder ?? "—"}    Opened ${when(sheet.openedAt, tz)} by ${sheet.openedBy?.name ?? "—"}`);
  doc.text(`Limits: ${sheet.limitTable.name}, version ${sheet.limitTable.version} — ${sheet.limitTable.sourceDocument}, rev. ${sheet.limitTable.sourceRevision} (${unit}). Verify against the manufacturer's current data.`);
  doc.text(`Printed ${when(printedAt.toISOString(), tz)} (${tz}). Status: ${sheet.locked ? "signed" : sheet.changedSinceSignoff ? "corrected since sign-off — needs signing again" : "open"}.`);
  doc.moveDown(0.6);

  const header = () => {
    let x = left;
    doc.font("bold").fontSize(8);
    const y = doc.y;
    for (const c of COLS) {
      doc.text(c.title, x, y, { width: c.w - 4 });
      x += c.w;
    }
    doc.moveTo(left, doc.y + 2).lineTo(left + COLS.reduce((a, c) => a + c.w, 0), doc.y + 2).stroke();
    doc.y += 4;
    doc.font("body");
  };
  header();
  let section: string | null = null;
  for (const item of sheet.items) {
    if (item.section && item.section !== section) {
      section = item.section;
      if (doc.y + 30 > bottom()) {
        doc.addPage();
        header();
      }
      doc.font("bold").fontSize(9).text(section, left, doc.y + 4).font("body");
    }
    for (const row of item.rows) {
      const cells = rowCells(item, row, unit, tz);
      doc.fontSize(7.5);
      const h = Math.max(...COLS.map((c) => doc.heightOfString(cells[c.key] || " ", { width: c.w - 4 }))) + 4;
      if (doc.y + h > bottom()) {
        doc.addPage();
        header();
      }
      const y = doc.y;
      let x = left;
      for (const c of COLS) {
        doc.fillColor(c.key === "verdict" && row.verdict === "outside_limits" ? "#a11" : "black").text(cells[c.key], x, y, { width: c.w - 4 });
        x += c.w;
      }
      doc.fillColor("black");
      doc.y = y + h;
      doc.moveTo(left, doc.y - 2).lineTo(left + COLS.reduce((a, c) => a + c.w, 0), doc.y - 2).lineWidth(0.3).strokeColor("#bbb").stroke().strokeColor("black").lineWidth(1);
    }
  }

  const block = (title: string, lines: string[]) => {
    doc.x = left;
    if (doc.y + 40 > bottom()) doc.addPage();
    doc.moveDown(0.8).font("bold").fontSize(10).text(title, left).font("body").fontSize(8.5);
    for (const l of lines) doc.text(l, left);
  };
  block(
    "Tools used (status and calibration due date at the time of the reading)",
    sheet.tools.length
      ? sheet.tools.map((t) => `${t.assetTag} — ${t.description}: ${STATUS_LABELS[t.statusAtReading as ToolStatus] ?? t.statusAtReading}, due ${t.dueAtReading ?? "—"} (${t.readings} reading${t.readings === 1 ? "" : "s"})`)
      : ["No tools recorded yet."],
  );
  block(
    "Sign-off",
    sheet.signoffs.length
      ? sheet.signoffs.map((s) => `Signed by ${s.inspector.name}, certificate ${s.certificateNumber}, ${when(s.signedAt, tz)}${s.note ? ` — ${s.note}` : ""}`)
      : ["Not signed."],
  );
  if (sheet.changedSinceSignoff) block("Note", ["A reading was corrected after the last sign-off; the sheet must be signed again."]);
  block("Cautions", [CAUTIONS.join(" ")]);
  doc.end();
  return done;
}
