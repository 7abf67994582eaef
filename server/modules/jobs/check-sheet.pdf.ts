import type { LengthUnit } from "../../../shared/common/units";
import { clearanceText, JUDGING_RULES_VERSION as RULES, lengthText, type PlaceView } from "../../../shared/inspection/judging";
import { formatExactLength } from "../../../shared/investigations/format";
import { FLAG_LABELS, type ReadingFlag } from "../../../shared/readings/readings.schemas";
import { STATUS_LABELS, type ToolStatus } from "../../../shared/tools/tool-status";
import type { CheckSheet, SheetItem, SheetRow } from "../../../shared/jobs/jobs.schemas";
import { CAUTIONS } from "../../../shared/common/cautions";
import { newPdf, printedInstant } from "../../platform/pdf";

const when = printedInstant;

const COLS = [
  { key: "item", title: "Item", w: 100 },
  { key: "no", title: "No.", w: 20 },
  { key: "values", title: "Readings", w: 104 },
  { key: "size", title: "Size / fit / form", w: 92 },
  { key: "verdict", title: "Verdict (current rules)", w: 120 },
  { key: "tools", title: "Tools", w: 48 },
  { key: "who", title: "Measured by", w: 56 },
] as const;

const leaves = (st: { leaves: { label: string }[]; thickness: number } | null, unit: LengthUnit) =>
  st ? `${st.leaves.map((l) => l.label).join(" + ")}${st.leaves.length > 1 ? " stack" : ""} (${lengthText(st.thickness, unit)})` : "—";

/** The values cell and the result cell of one place, in words: every reading, both fits, form, 20 °C, leaves. */
export function placeCells(place: PlaceView, unit: LengthUnit): { values: string; result: string } {
  switch (place.kind) {
    case "size": {
      const values = place.directions
        .map((d) => `${d.direction}: ${formatExactLength(d.raw, d.rawUnit)} ${d.rawUnit}${d.beyond ? ` — ${lengthText(d.beyond.by, unit)} ${d.beyond.side === "max" ? "over" : "under"} ${d.beyond.side}` : ""}`)
        .join("\n");
      const lines = [`size ${lengthText(place.rawSize, unit)} ${unit}`];
      if (place.thermal) lines.push(`at 20 °C ${lengthText(place.size, unit)} (${place.thermal.partTemperatureC} °C, corr. ${lengthText(place.thermal.correction, unit)})`);
      lines.push(
        `OOR ${lengthText(place.outOfRound, unit)}${place.outOfRoundLimit != null ? ` (max ${lengthText(place.outOfRoundLimit, unit)}${place.outOfRoundVerdict === "outside_limits" ? ", over" : ""})` : ""}`,
      );
      return { values, result: lines.join("\n") };
    }
    case "fit": {
      const word = place.basis === "radial" ? " radial" : "";
      const side = (name: string, s: typeof place.loosest) =>
        `${name} ${clearanceText(s.value, unit)}${word}${place.basis === "radial" ? ` (${lengthText(s.diametral, unit)} diam.)` : ""}${s.verdict === "outside_limits" ? " — OUT" : ""}`;
      return {
        values: `loosest: ${lengthText(place.loosest.boreValue, unit)} − ${lengthText(place.loosest.journalValue, unit)}\ntightest: ${lengthText(place.tightest.boreValue, unit)} − ${lengthText(place.tightest.journalValue, unit)}`,
        result: `${side("loosest", place.loosest)}\n${side("tightest", place.tightest)}`,
      };
    }
    case "taper":
      return {
        values: place.directions.map((d) => `${d.direction}: ${lengthText(d.a, unit)} − ${lengthText(d.b, unit)}`).join("\n"),
        result: `taper ${lengthText(place.taper, unit)}${place.limit != null ? ` (max ${lengthText(place.limit, unit)})` : ""}`,
      };
    case "feeler":
      if (place.mode === "measured_gap") return { values: `thickest to enter: ${leaves(place.gap, unit)}`, result: `measured gap ${place.gapLow == null ? "—" : lengthText(place.gapLow, unit)}` };
      return {
        values: `go ${leaves(place.go, unit)} ${place.goEntered ? "entered" : "did not enter"}\nno-go ${leaves(place.noGo, unit)} ${place.noGoEntered ? "entered" : "did not enter"}`,
        result: `gap ${place.gapLow == null ? "not shown to reach any leaf" : `at least ${lengthText(place.gapLow, unit)}`}${place.gapHigh == null ? "" : `, under ${lengthText(place.gapHigh, unit)}`}`,
      };
    default:
      return { values: "", result: "" };
  }
}

/** Why these leaves, short enough for a cell: the measured gap's reason in full, otherwise how the leaves were chosen. */
function feelerWhy(place: Extract<PlaceView, { kind: "feeler" }>): string {
  if (place.mode === "measured_gap") return place.why ?? "";
  if (place.why?.startsWith("Recorded before")) return "Leaves as recorded under rules 1 (go under the minimum, no-go over the maximum).";
  return "Go: thinnest at or above the minimum; no-go: thickest at or below the maximum (calibrated thicknesses).";
}

function rowCells(item: SheetItem, row: SheetRow, unit: LengthUnit, tz: string): Record<(typeof COLS)[number]["key"], string> {
  const r = row.reading;
  let { values, result } = placeCells(row.place, unit);
  if (row.place.kind === "pending") result = item.kind === "clearance" || item.kind === "taper" ? "pending" : "";
  if (r?.visualResult) values = r.finding ?? "";
  if (row.place.kind === "feeler" && row.place.why) values += `\n${feelerWhy(row.place)}`;
  const flags = row.flags.map((f) => FLAG_LABELS[f as ReadingFlag] ?? f).join("; ");
  const verdict = [
    row.verdictText,
    row.judgedDifferently && r ? `Recorded ${r.recordedVerdict === "within_limits" ? "within" : "outside"} limits under earlier rules; judged again under rules v${RULES}.` : "",
    row.place.kind === "size" && row.place.thermal ? row.place.thermal.text : "",
    flags ? `! ${flags}` : "",
    r?.supersedeReason ? `Corrected: ${r.supersedeReason}` : "",
    r?.overrideReason ? `Override: ${r.overrideReason}` : "",
  ].filter(Boolean);
  return {
    item: `${item.label}${item.kind === "clearance" && item.radial ? " (radial)" : ""}`,
    no: String(row.index),
    values,
    size: result,
    verdict: verdict.join("\n"),
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
  doc.text(
    `Verdicts under the current judging rules (v${RULES}): every reading against the size limits; clearances at their loosest (against the maximum) and tightest (against the minimum), radial where the table says so; ` +
      "out-of-round and taper where limited; lengths at 20 °C where a part temperature and an expansion coefficient are known; feeler leaves inside the limits.",
  );
  if (sheet.summary.judgedDifferently > 0) {
    doc.fillColor("#a11").text(`${sheet.summary.judgedDifferently} reading(s) were recorded with another verdict than the current rules give; each is marked. The readings are kept as recorded.`).fillColor("black");
  }
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
        // The header prints at its own size; the row is drawn at the size it was measured at.
        doc.fontSize(7.5);
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
