import { newPdf, printedInstant } from "../../platform/pdf";
import { CAUTIONS } from "../../../shared/common/cautions";
import { VERDICT_LABELS } from "../../../shared/studies/study-labels";
import type { StudyAnalysis, StudyDetail } from "../../../shared/studies/studies.schemas";

type Doc = PDFKit.PDFDocument;

// Appraisers are told apart by shape as well as colour (the report may be printed in black and white).
const COLOURS = ["#1f2f3d", "#b8862f", "#2f7a4f"];
const LETTERS = "ABC";

const fmt = (x: number | null | undefined, digits = 4) => (x == null || !Number.isFinite(x) ? "—" : Number(x.toPrecision(digits)).toString());
const pct = (x: number | null | undefined) => (x == null ? "—" : `${x.toFixed(1)} %`);

function marker(doc: Doc, shape: number, x: number, y: number, colour: string) {
  doc.save().fillColor(colour);
  if (shape === 0) doc.circle(x, y, 2.4).fill();
  else if (shape === 1) doc.rect(x - 2.2, y - 2.2, 4.4, 4.4).fill();
  else doc.polygon([x, y - 2.8], [x - 2.6, y + 2], [x + 2.6, y + 2]).fill();
  doc.restore();
}

interface Series {
  name: string;
  shape: number;
  colour: string;
  points: { x: number; y: number }[];
  joined: boolean;
}

/** A plain line chart in a box: series of points, horizontal reference lines, labelled x positions. */
function lineChart(
  doc: Doc,
  box: { x: number; y: number; w: number; h: number },
  opts: { title: string; series: Series[]; lines: { y: number; label: string }[]; xLabels: { x: number; label: string }[]; xMax: number; groups?: { from: number; to: number; label: string }[] },
) {
  const { x, y, w, h } = box;
  const left = x + 44;
  const top = y + 16;
  const plotW = w - 52;
  const plotH = h - 36;
  const ys = [...opts.series.flatMap((s) => s.points.map((p) => p.y)), ...opts.lines.map((l) => l.y)];
  let lo = Math.min(...ys);
  let hi = Math.max(...ys);
  if (hi === lo) {
    hi += 1;
    lo -= 1;
  }
  const pad = (hi - lo) * 0.08;
  lo -= pad;
  hi += pad;
  const px = (v: number) => left + (plotW * (v - 0.5)) / Math.max(opts.xMax, 1);
  const py = (v: number) => top + plotH - (plotH * (v - lo)) / (hi - lo);

  doc.font("bold").fontSize(9).fillColor("black").text(opts.title, x, y, { width: w });
  doc.save().lineWidth(0.5).strokeColor("#999").rect(left, top, plotW, plotH).stroke().restore();
  doc.font("body").fontSize(6.5).fillColor("#333");
  for (let k = 0; k <= 4; k++) {
    const v = lo + ((hi - lo) * k) / 4;
    doc.text(fmt(v, 3), x, py(v) - 3, { width: 40, align: "right" });
  }
  for (const l of opts.lines) {
    doc.save().lineWidth(0.6).dash(3, { space: 2 }).strokeColor("#b3261e").moveTo(left, py(l.y)).lineTo(left + plotW, py(l.y)).stroke().undash().restore();
    doc.fillColor("#b3261e").text(l.label, left + plotW - 80, py(l.y) - 8, { width: 78, align: "right" });
  }
  for (const g of opts.groups ?? []) {
    if (g.from > 1) doc.save().lineWidth(0.4).strokeColor("#bbb").moveTo(px(g.from - 0.5), top).lineTo(px(g.from - 0.5), top + plotH).stroke().restore();
    doc.fillColor("#333").text(g.label, px(g.from) - 4, top + 2, { width: px(g.to) - px(g.from) + 8, align: "center" });
  }
  for (const s of opts.series) {
    if (s.joined && s.points.length > 1) {
      doc.save().lineWidth(0.8).strokeColor(s.colour);
      s.points.forEach((p, i) => (i === 0 ? doc.moveTo(px(p.x), py(p.y)) : doc.lineTo(px(p.x), py(p.y))));
      doc.stroke().restore();
    }
    for (const p of s.points) marker(doc, s.shape, px(p.x), py(p.y), s.colour);
  }
  doc.fillColor("#333");
  for (const l of opts.xLabels) doc.text(l.label, px(l.x) - 10, top + plotH + 3, { width: 20, align: "center" });
  doc.fillColor("black");
}

/** Grouped bars of the components: % contribution, % of total variation, % of tolerance. */
function componentsChart(doc: Doc, box: { x: number; y: number; w: number; h: number }, a: StudyAnalysis) {
  const keys = ["grr", "repeatability", "reproducibility", "part"] as const;
  const bars = [
    { name: "% contribution", colour: "#1f2f3d", get: (k: string) => a.anova.components.find((c) => c.key === k)?.percentContribution ?? 0 },
    { name: "% of total variation", colour: "#b8862f", get: (k: string) => a.anova.components.find((c) => c.key === k)?.percentTotalVariation ?? 0 },
    { name: "% of tolerance", colour: "#5b4a8b", get: (k: string) => a.anova.components.find((c) => c.key === k)?.percentTolerance ?? 0 },
  ];
  const { x, y, w, h } = box;
  const left = x + 30;
  const top = y + 28;
  const plotW = w - 36;
  const plotH = h - 48;
  const max = Math.max(100, ...keys.flatMap((k) => bars.map((b) => b.get(k))));
  doc.font("bold").fontSize(9).text("Components of variation (ANOVA)", x, y);
  doc.font("body").fontSize(6.5);
  bars.forEach((b, i) => {
    doc.save().fillColor(b.colour).rect(x + i * 95, y + 13, 7, 7).fill().restore();
    doc.fillColor("#333").text(b.name, x + i * 95 + 10, y + 13.5);
  });
  doc.save().lineWidth(0.5).strokeColor("#999").moveTo(left, top).lineTo(left, top + plotH).lineTo(left + plotW, top + plotH).stroke().restore();
  for (const t of [0, 50, ...(max < 110 ? [100] : [100, max])]) doc.fillColor("#333").text(`${Math.round(t)}`, x, top + plotH - (plotH * t) / max - 3, { width: 26, align: "right" });
  for (const t of [10, 30]) {
    const yy = top + plotH - (plotH * t) / max;
    doc.save().lineWidth(0.5).dash(2, { space: 2 }).strokeColor("#b3261e").moveTo(left, yy).lineTo(left + plotW, yy).stroke().undash().restore();
  }
  const groupW = plotW / keys.length;
  keys.forEach((k, gi) => {
    bars.forEach((b, bi) => {
      const v = b.get(k);
      const bw = (groupW * 0.7) / bars.length;
      const bx = left + gi * groupW + groupW * 0.15 + bi * bw;
      const bh = (plotH * v) / max;
      doc.save().fillColor(b.colour).rect(bx, top + plotH - bh, bw - 1, bh).fill().restore();
    });
    doc.fillColor("#333").text({ grr: "Gauge R&R", repeatability: "Repeatability", reproducibility: "Reproducibility", part: "Part-to-part" }[k], left + gi * groupW, top + plotH + 3, { width: groupW, align: "center" });
  });
  doc.fillColor("black");
}

/**
 * The study report: the characteristic and its tolerance, who measured what with which tool, both methods'
 * results, the verdict band and its reasons, the four charts, every value with its corrections, and the cautions.
 */
export function writeStudyPdf(s: StudyDetail, printedAt: Date, tz: string): Promise<Buffer> {
  const { doc, done } = newPdf(`Gauge study ${s.reference}`, { margin: 44 });
  const c = s.characteristic;
  const u = c.unit;
  const heading = (text: string) => doc.moveDown(0.6).font("bold").fontSize(11.5).fillColor("black").text(text, 44).font("body").fontSize(9);
  const fact = (k: string, v: string) => doc.font("bold").text(`${k}: `, { continued: true }).font("body").text(v);

  doc.font("bold").fontSize(16).text(`Gauge study ${s.reference} — repeatability and reproducibility`);
  doc.font("body").fontSize(8.5).fillColor("#555").text(`Printed ${printedInstant(printedAt.toISOString(), tz)} (${tz}) by Tenthwise${s.isDemo ? " · DEMO DATA (invented)" : ""}`).fillColor("black").fontSize(9);

  heading("Study");
  fact("Characteristic", `${c.label} (${c.itemKey}) — ${c.tableName}, ${c.engineModel}, version ${c.tableVersion}`);
  fact("Limits", `${c.min} – ${c.max} ${u}; tolerance ${fmt(c.tolerance, 6)} ${u}`);
  fact("Measuring system", s.tool ? `${s.tool.assetTag} — ${s.tool.description} (${s.family.name})` : `any tool of the family ${s.family.name}`);
  fact("Design", `${s.parts} parts × ${s.appraisers.length} appraisers × ${s.trials} trials, crossed, in a randomized order per appraiser and trial`);
  fact("Appraisers", s.appraisers.map((a, i) => `${LETTERS[i]}: ${a.name}`).join("; "));
  fact("Parts", s.partLabels.map((l, i) => `${i + 1}: ${l}`).join("; "));
  fact("Set up", `${printedInstant(s.createdAt, tz)}${s.createdBy ? ` by ${s.createdBy.name}` : ""}`);
  if (s.purpose) fact("Purpose", s.purpose);
  fact("State", s.state === "complete" ? `complete ${s.completedAt ? printedInstant(s.completedAt, tz) : ""}` : `in progress: ${s.valuesTaken} of ${s.valuesNeeded} values`);

  const a = s.analysis;
  if (!a) {
    heading("Results");
    doc.text("The study is not complete yet; results appear once every appraiser has measured every part in every trial.");
  } else {
    const v = a.anova.verdict;
    heading("Verdict");
    doc.font("bold").fontSize(12).fillColor(v.verdict === "acceptable" ? "#2f7a4f" : v.verdict === "conditional" ? "#a86a00" : "#b3261e").text(`${VERDICT_LABELS[v.verdict]} — GRR ${pct(v.percentGrr)} of the ${v.basis === "tolerance" ? "tolerance" : "total variation"}, ndc ${a.anova.ndc ?? "—"}`);
    doc.font("body").fontSize(9).fillColor("black");
    for (const r of v.reasons) doc.text(`• ${r}`);
    doc.text("Bands (AIAG MSA 4th ed.): below 10 % acceptable; 10–30 % may be acceptable for some uses; above 30 % not acceptable; at least 5 distinct categories.");

    heading("ANOVA method (two-way random effects, parts × appraisers)");
    doc.text(
      `Interaction p = ${fmt(a.anova.pInteraction, 4)} against alpha = ${a.anova.alpha}: ${a.anova.pooled ? "pooled into repeatability" : "kept in the model"}.` +
        (a.anova.negativeSetToZero.length ? ` Negative estimates set to zero: ${a.anova.negativeSetToZero.join(", ")}.` : ""),
    );
    const cols = [44, 150, 190, 270, 340, 400];
    const tableRow = (cells: string[], bold = false) => {
      const yy = doc.y;
      doc.font(bold ? "bold" : "body");
      cells.forEach((t, i) => doc.text(t, cols[i], yy, { width: (cols[i + 1] ?? 540) - cols[i] - 4, lineBreak: false }));
      doc.font("body").text("", 44, yy + 11);
    };
    tableRow(["Source", "df", "SS", "MS", "F", "p"], true);
    for (const r of a.anova.table) tableRow([r.source, String(r.df), fmt(r.ss, 6), fmt(r.ms, 6), fmt(r.f, 4), r.p == null ? "" : fmt(r.p, 3)]);
    doc.moveDown(0.4);
    // The report's font carries Latin only: short names, and SD for the standard deviation.
    const SHORT: Record<string, string> = { repeatability: "Repeatability (EV)", reproducibility: "Reproducibility (AV)", appraiser: "Appraiser", interaction: "Appraiser × part", grr: "Gauge R&R (GRR)", part: "Part-to-part (PV)", total: "Total variation (TV)" };
    const ccols = [44, 165, 245, 320, 395, 460];
    const compRow = (cells: string[], bold = false) => {
      const yy = doc.y;
      doc.font(bold ? "bold" : "body");
      cells.forEach((t, i) => doc.text(t, ccols[i], yy, { width: (ccols[i + 1] ?? 560) - ccols[i] - 4, lineBreak: false }));
      doc.font("body").text("", 44, yy + 11);
    };
    compRow(["Component", "Variance", `SD (${u})`, "% contribution", "% of TV", "% of tolerance"], true);
    for (const k of a.anova.components) compRow([SHORT[k.key], fmt(k.variance, 6), fmt(k.sd, 6), pct(k.percentContribution), pct(k.percentTotalVariation), pct(k.percentTolerance)]);
    doc.text(`Number of distinct categories: ${a.anova.ndc ?? "—"} (1.41 × SD part / SD GRR, truncated).`, 44);

    heading("Average-and-range method");
    const ar = a.averageRange;
    doc.text(
      `Average range by appraiser ${ar.rangeByAppraiser.map((r, i) => `${LETTERS[i]} ${fmt(r, 4)}`).join(", ")}; overall ${fmt(ar.rBarBar, 6)}; spread of appraiser averages ${fmt(ar.xBarDiff, 6)}; range of part averages ${fmt(ar.partRange, 6)}; ` +
        `K1 ${ar.constants.K1}, K2 ${ar.constants.K2}, K3 ${ar.constants.K3}.`,
    );
    doc.text(
      `EV ${fmt(ar.ev, 6)}, AV ${fmt(ar.av, 6)}, GRR ${fmt(ar.grr, 6)}, PV ${fmt(ar.pv, 6)}, TV ${fmt(ar.tv, 6)} ${u}; ` +
        `GRR ${pct(ar.components.find((x) => x.key === "grr")!.percentTotalVariation)} of TV, ${pct(ar.components.find((x) => x.key === "grr")!.percentTolerance)} of tolerance; ndc ${ar.ndc ?? "—"}; ${VERDICT_LABELS[ar.verdict.verdict].toLowerCase()}.`,
    );

    doc.addPage();
    doc.font("bold").fontSize(12).text(`${s.reference} — charts`, 44, 44);
    const parts = s.parts;
    const nA = s.appraisers.length;
    const groups = s.appraisers.map((ap, j) => ({ from: j * parts + 1, to: (j + 1) * parts, label: `${LETTERS[j]}: ${ap.name}` }));
    const byApp = (pts: { appraiser: number; part: number; value: number }[]) =>
      s.appraisers.map((ap, j) => ({ name: ap.name, shape: j, colour: COLOURS[j], joined: true, points: pts.filter((p) => p.appraiser === j).map((p) => ({ x: j * parts + p.part + 1, y: p.value })) }));
    const xLabels = Array.from({ length: parts * nA }, (_, i) => ({ x: i + 1, label: String((i % parts) + 1) }));
    lineChart(doc, { x: 44, y: 70, w: 520, h: 150 }, {
      title: `Range chart by appraiser (${u}): upper limit D4 × average range`,
      series: byApp(a.charts.range.points),
      lines: [{ y: a.charts.range.ucl, label: `UCL ${fmt(a.charts.range.ucl, 3)}` }, { y: a.charts.range.center, label: `mean ${fmt(a.charts.range.center, 3)}` }],
      xLabels,
      xMax: parts * nA,
      groups,
    });
    lineChart(doc, { x: 44, y: 235, w: 520, h: 150 }, {
      title: `Average chart by appraiser (${u}): limits grand mean ± A2 × average range; ${a.charts.average.percentBeyond.toFixed(0)} % of averages outside`,
      series: byApp(a.charts.average.points),
      lines: [{ y: a.charts.average.ucl, label: `UCL ${fmt(a.charts.average.ucl, 4)}` }, { y: a.charts.average.lcl, label: `LCL ${fmt(a.charts.average.lcl, 4)}` }],
      xLabels,
      xMax: parts * nA,
      groups,
    });
    lineChart(doc, { x: 44, y: 400, w: 520, h: 150 }, {
      title: `Appraiser × part interaction: each appraiser's average per part (${u})`,
      series: s.appraisers.map((ap, j) => ({ name: ap.name, shape: j, colour: COLOURS[j], joined: true, points: a.charts.interaction.map((p) => ({ x: p.part + 1, y: p.byAppraiser[j] })) })),
      lines: [],
      xLabels: Array.from({ length: parts }, (_, i) => ({ x: i + 1, label: String(i + 1) })),
      xMax: parts,
    });
    doc.font("body").fontSize(7);
    s.appraisers.forEach((ap, j) => {
      marker(doc, j, 60 + j * 150, 560, COLOURS[j]);
      doc.fillColor("#333").text(`${LETTERS[j]}: ${ap.name}`, 66 + j * 150, 557);
    });
    componentsChart(doc, { x: 44, y: 580, w: 520, h: 150 }, a);
  }

  doc.addPage();
  doc.font("bold").fontSize(11.5).text("Values as taken (in the unit of the tool read)", 44, 44).font("body").fontSize(7.5);
  const vcols = [44, 90, 200, 240, 275, 345, 470];
  const vrow = (cells: string[], bold = false) => {
    if (doc.y > doc.page.height - 70) doc.addPage();
    const yy = doc.y;
    doc.font(bold ? "bold" : "body");
    cells.forEach((t, i) => doc.text(t, vcols[i], yy, { width: (vcols[i + 1] ?? 570) - vcols[i] - 4, lineBreak: false }));
    doc.font("body").text("", 44, yy + 10);
  };
  vrow(["Order", "Appraiser", "Part", "Trial", "Value", "Tools (status then)", "Taken"], true);
  for (const v of [...s.values].sort((x, y) => x.appraiser.name.localeCompare(y.appraiser.name) || x.position - y.position)) {
    vrow([
      String(v.position),
      v.appraiser.name,
      v.partLabel,
      String(v.trial),
      `${v.value} ${v.unit}${v.supersededById ? " (corrected)" : ""}`,
      v.tools.map((t) => `${t.assetTag} ${t.statusAtReading.replace(/_/g, " ")}`).join(", "),
      printedInstant(v.takenAt, tz),
    ]);
    if (v.supersedesId) vrow(["", "", "", "", "", `correction: ${v.supersedeReason ?? ""}`, ""]);
  }

  doc.moveDown(1).font("bold").fontSize(10).text("Cautions", 44).font("body").fontSize(8.5);
  for (const line of CAUTIONS) doc.text(line, 44);
  doc.text("A gauge study judges the measuring system on the parts and people of the study; it does not replace the calibration of each tool.", 44);
  doc.end();
  return done;
}
