import { newPdf, printedInstant } from "../../platform/pdf";
import { CAUTIONS } from "../../../shared/common/cautions";
import { lengthWithUnit, signedLengthWithUnit } from "../../../shared/investigations/format";
import { RESULT_LABELS, type Calibration } from "../../../shared/calibrations/calibrations.schemas";
import { AS_FOUND_STATEMENT_LABELS, AS_FOUND_STATEMENT_MEANINGS, DECISION_RULE_LABELS } from "../../../shared/calibrations/decision-rules";
import { budgetLength, budgetQuantity, budgetSensitivity, budgetSummary, DISTRIBUTION_LABELS, dofText } from "../../../shared/calibrations/budget-format";

type Column = { title: string; width: number; align?: "left" | "right" };

/**
 * The signed calibration record: what was measured, how each point was found (ILAC-G8 statement) and released
 * (the decision rule), and every point's uncertainty budget as the table a calibration engineer signs.
 */
export function writeCalibrationPdf(c: Calibration, tool: { description: string; serialNumber: string }, printedAt: Date, tz: string): Promise<Buffer> {
  const { doc, done } = newPdf(`Calibration ${c.assetTag} ${c.performedAt.slice(0, 10)}`, { margin: 40, layout: "landscape" });
  const u = c.unit;
  const left = doc.page.margins.left;
  const bottom = () => doc.page.height - doc.page.margins.bottom;

  const heading = (text: string) => {
    if (doc.y > bottom() - 60) doc.addPage();
    doc.moveDown(0.6).font("bold").fontSize(11.5).text(text, left).font("body").fontSize(8.5);
  };
  const fact = (k: string, v: string) => doc.font("bold").text(`${k}: `, left, undefined, { continued: true }).font("body").text(v);

  /** A table with a header row; rows break onto a new page with the header repeated. */
  const table = (columns: Column[], rows: string[][], fontSize = 7.5) => {
    const draw = (cells: string[], bold: boolean) => {
      doc.font(bold ? "bold" : "body").fontSize(fontSize);
      const heights = cells.map((t, i) => doc.heightOfString(t, { width: columns[i].width - 4 }));
      const h = Math.max(...heights) + 3;
      if (doc.y + h > bottom()) {
        doc.addPage();
        if (!bold) draw(columns.map((col) => col.title), true);
      }
      const y = doc.y;
      let x = left;
      cells.forEach((t, i) => {
        doc.text(t, x + 2, y + 1.5, { width: columns[i].width - 4, align: columns[i].align ?? "left", lineBreak: true });
        x += columns[i].width;
      });
      doc
        .moveTo(left, y + h)
        .lineTo(x, y + h)
        .lineWidth(bold ? 0.8 : 0.3)
        .strokeColor(bold ? "#333" : "#bbb")
        .stroke();
      doc.x = left;
      doc.y = y + h;
    };
    draw(columns.map((col) => col.title), true);
    for (const r of rows) draw(r, false);
    doc.fontSize(8.5).font("body");
  };

  doc.font("bold").fontSize(16).text(`Calibration record — ${c.assetTag}`);
  doc.font("body").fontSize(8.5).fillColor("#555").text(`Printed ${printedInstant(printedAt.toISOString(), tz)} (${tz}) by Tenthwise. A signed record: never edited; corrections supersede it with a reason.`).fillColor("black");

  heading("Record");
  fact("Tool", `${c.assetTag} — ${tool.description} (serial ${tool.serialNumber})`);
  fact("Performed", `${printedInstant(c.performedAt, tz)} ${c.source === "in_house" ? `in-house${c.performedBy ? ` by ${c.performedBy.name}` : ""}` : `by ${c.lab?.name ?? "an outside lab"}${c.performedByName ? ` (${c.performedByName})` : ""}`}`);
  if (c.certificateNumber) fact("Certificate", c.certificateNumber);
  fact(
    "Environment",
    [c.temperatureC != null ? `${c.temperatureC} °C` : "temperature not recorded", c.temperatureVariationC != null ? `variation ± ${c.temperatureVariationC} °C` : null, c.humidityPct != null ? `${c.humidityPct} % RH` : null]
      .filter(Boolean)
      .join(", "),
  );
  fact("Standards", c.standards.length ? c.standards.map((s) => `${s.assetTag} ${s.name}`).join("; ") : "none named");
  fact("Decision rule", `${DECISION_RULE_LABELS[c.decisionRule]}${c.decisionRule === "guarded_scaled" ? `, r = ${c.guardBandMultiplier}` : ""}`);
  fact("As found", `${c.asFoundInTolerance ? "in tolerance" : "OUT OF TOLERANCE"} (error against ± MPE); statement: ${AS_FOUND_STATEMENT_LABELS[c.asFoundStatement]} — ${AS_FOUND_STATEMENT_MEANINGS[c.asFoundStatement]} (ILAC-G8)`);
  fact("Adjusted", c.adjusted ? "yes — released on the as-left readings" : "no — released on the as-found readings");
  fact("Release decision", `${RESULT_LABELS[c.result]}${c.limitedRange ? ` (${lengthWithUnit(c.limitedRange.min, u)} – ${lengthWithUnit(c.limitedRange.max, u)}${c.limitedRange.note ? `: ${c.limitedRange.note}` : ""})` : ""}`);
  fact("Next due", c.nextDueAt);
  if (c.supersedesId) fact("Corrects an earlier record", c.supersedeReason ?? "");
  if (c.supersededById) fact("Superseded", "a later record corrects this one; it no longer counts");
  if (c.notes) fact("Notes", c.notes);

  heading("Check points");
  table(
    [
      { title: "#", width: 20 },
      { title: "Nominal", width: 62, align: "right" },
      { title: "Reference", width: 66, align: "right" },
      { title: "As found", width: 62, align: "right" },
      { title: "Error", width: 58, align: "right" },
      { title: "As left (error)", width: 96, align: "right" },
      { title: "MPE ±", width: 52, align: "right" },
      { title: "U", width: 56, align: "right" },
      { title: "Guard band w", width: 56, align: "right" },
      { title: "TUR", width: 34, align: "right" },
      { title: "As-found statement", width: 68 },
      { title: "Release", width: 66 },
    ],
    c.points.map((p) => [
      `${p.seq}${p.elementLabel ? ` ${p.elementLabel}` : ""}`,
      lengthWithUnit(p.nominal, u),
      lengthWithUnit(p.reference, u),
      lengthWithUnit(p.asFound, u),
      signedLengthWithUnit(p.errorAsFound, u),
      p.asLeft == null ? "—" : `${lengthWithUnit(p.asLeft, u)} (${signedLengthWithUnit(p.errorAsLeft, u)})`,
      lengthWithUnit(p.mpe, u),
      p.uncertainty == null ? "—" : lengthWithUnit(p.uncertainty, u),
      lengthWithUnit(p.guardBand, u),
      p.tur == null ? "—" : `${p.tur.toFixed(1)}:1`,
      AS_FOUND_STATEMENT_LABELS[p.asFoundStatement],
      `${p.verdict === "pass" ? "released" : "NOT released"} on ${p.releasedOn === "as_left" ? "as left" : "as found"}`,
    ]),
  );

  heading("Uncertainty budget of each point (JCGM 100: root-sum-square, Welch-Satterthwaite degrees of freedom, k from the t-distribution)");
  for (const p of c.points) {
    if (doc.y > bottom() - 90) doc.addPage();
    doc.moveDown(0.4).font("bold").fontSize(9).text(`Point ${p.seq}: ${lengthWithUnit(p.nominal, u)}${p.elementLabel ? ` (element ${p.elementLabel})` : ""}`, left);
    doc.font("body").fontSize(8);
    if (p.referenceParts.length) {
      doc.text(`Reference ${lengthWithUnit(p.reference, u)} from ${p.referenceParts.map((r) => `${r.standard}${r.element ? ` block ${r.element}` : ""} ${r.certified ? `certified ${lengthWithUnit(r.value, u)}` : "at nominal"}`).join(" + ")}.`, left);
    }
    if (!p.budget) {
      doc.text(p.uncertainty == null ? "No uncertainty stated and none could be computed." : `U = ${lengthWithUnit(p.uncertainty, u)} as entered on the record (e.g. from the lab's certificate); no budget was computed.`, left);
      continue;
    }
    const b = p.budget;
    table(
      [
        { title: "Source", width: 240 },
        { title: "Type", width: 30 },
        { title: "Distribution", width: 58 },
        { title: "Value", width: 78, align: "right" },
        { title: "Divisor", width: 42, align: "right" },
        { title: "Sensitivity c", width: 70, align: "right" },
        { title: "|c|·u", width: 64, align: "right" },
        { title: "Degrees of freedom", width: 54, align: "right" },
      ],
      b.components.map((r) => [r.source, r.type, DISTRIBUTION_LABELS[r.distribution], budgetQuantity(r, u), r.divisorLabel, budgetSensitivity(r, u), budgetLength(r.contribution, u), dofText(r.dof)]),
    );
    doc.font("bold").fontSize(8).text(budgetSummary(b, p.uncertainty), left).font("body");
    for (const n of b.notes) doc.fillColor("#555").text(n, left).fillColor("black");
  }

  heading("Cautions");
  for (const line of CAUTIONS) doc.text(`• ${line}`, left);
  doc.end();
  return done;
}
