import { STATUS_LABELS } from "../../../shared/tools/tool-status";
import type { CalibrationLabel, DoNotUseTag } from "../../../shared/checkouts/labels.schemas";
import { CAUTIONS } from "../../../shared/common/cautions";
import { newPdf } from "../../platform/pdf";

const PT = 72; // points per inch
/**
 * Common 30-up address-label stock on US Letter: 3 columns × 10 rows of
 * 2-5/8 × 1 in labels, 1/2 in top margin, 3/16 in side margin, 1/8 in gap
 * between columns (the stock's published layout; common practice, no source).
 */
export const SHEET_30UP = { cols: 3, rows: 10, w: 2.625 * PT, h: 1 * PT, top: 0.5 * PT, left: 0.1875 * PT, pitchX: 2.75 * PT, pitchY: 1 * PT } as const;

/** Labels and tags place everything themselves: no margin, no page until one is added. */
const newDoc = (title: string) => newPdf(title, { margin: 0, autoFirstPage: false });

const png = (dataUrl: string) => Buffer.from(dataUrl.split(",")[1], "base64");

/** A sheet (or several) of calibration labels; `skip` leaves the first positions of a partly used sheet empty. */
export function calibrationLabelsPdf(labels: CalibrationLabel[], opts: { skip: number; shopName: string; printedOn: string }): Promise<Buffer> {
  const { doc, done } = newDoc("Calibration labels");
  const L = SHEET_30UP;
  const perPage = L.cols * L.rows;
  const header = () => {
    // Printed in the sheet's top margin, off the labels.
    doc.font("bold").fontSize(6).fillColor("#333").text(`${opts.shopName} — calibration labels printed ${opts.printedOn}.`, L.left, 8, { width: 612 - 2 * L.left, lineBreak: false });
    doc.font("body").fontSize(5).text(`Cautions. ${CAUTIONS.join(" ")}`, L.left, 16, { width: 612 - 2 * L.left });
  };
  labels.forEach((label, i) => {
    const pos = i + opts.skip;
    if (i === 0 || pos % perPage === 0) {
      doc.addPage();
      header();
    }
    const slot = pos % perPage;
    const x = L.left + (slot % L.cols) * L.pitchX;
    const y = L.top + Math.floor(slot / L.cols) * L.pitchY;
    const pad = 5;
    const qr = L.h - 2 * pad;
    doc.image(png(label.qr), x + pad, y + pad, { width: qr, height: qr });
    const tx = x + pad + qr + 5;
    const tw = L.w - (tx - x) - pad;
    doc.fillColor("#000").font("bold").fontSize(11).text(label.assetTag, tx, y + pad, { width: tw, lineBreak: false, ellipsis: true });
    doc.font("body").fontSize(6.5).text(`Calibrated ${label.calibratedAt ?? "—"}`, tx, y + pad + 15, { width: tw, lineBreak: false });
    doc.font("bold").fontSize(9).text(label.dueAt ? `Due ${label.dueAt}` : label.status === "reference_only" ? "Reference only" : "Not calibrated", tx, y + pad + 24, { width: tw, lineBreak: false });
    doc.font("body").fontSize(6.5).text(`By ${label.calibratedBy ?? "—"}`, tx, y + pad + 37, { width: tw, lineBreak: false, ellipsis: true });
    doc.fontSize(5.5).fillColor("#444").text(label.usable ? "Scan for current status" : `Now: ${STATUS_LABELS[label.status]} — do not use`, tx, y + pad + 49, { width: tw, lineBreak: false, ellipsis: true });
  });
  doc.end();
  return done;
}

/** A full-page DO NOT USE tag with the tool, the reasons, who tagged it and the status QR code. */
export function doNotUsePdf(tag: DoNotUseTag, opts: { shopName: string }): Promise<Buffer> {
  const { doc, done } = newDoc(`Do not use ${tag.assetTag}`);
  doc.addPage();
  const m = 0.6 * PT;
  const w = 612 - 2 * m;
  doc.lineWidth(6).strokeColor("#b3261e").rect(m / 2, m / 2, 612 - m, 792 - m).stroke();
  doc.rect(m, m, w, 1.6 * PT).fill("#b3261e");
  doc.fillColor("#fff").font("bold").fontSize(72).text("DO NOT USE", m, m + 18, { width: w, align: "center" });
  let y = m + 1.6 * PT + 24;
  doc.fillColor("#000").font("bold").fontSize(48).text(tag.assetTag, m, y, { width: w, align: "center" });
  y = doc.y + 4;
  doc.font("body").fontSize(16).text(tag.description, m, y, { width: w, align: "center" });
  y = doc.y + 18;
  doc.font("bold").fontSize(20).fillColor("#b3261e").text(STATUS_LABELS[tag.status], m, y, { width: w, align: "center" });
  y = doc.y + 10;
  doc.fillColor("#000").font("body").fontSize(14);
  for (const r of tag.reasons) {
    doc.text(r, m + 20, y, { width: w - 40, align: "center" });
    y = doc.y + 6;
  }
  y += 10;
  doc.fontSize(12).text(`Tagged ${tag.taggedOn} by ${tag.taggedBy} — ${opts.shopName}`, m, y, { width: w, align: "center" });
  y = doc.y + 16;
  const qr = 2.2 * PT;
  doc.image(png(tag.qr), (612 - qr) / 2, y, { width: qr, height: qr });
  y += qr + 6;
  doc.fontSize(10).fillColor("#333").text(`Current status: ${tag.statusUrl}`, m, y, { width: w, align: "center" });
  doc.fontSize(10).text("Leave this tag on the tool until the crib or quality releases it.", m, doc.y + 6, { width: w, align: "center" });
  doc.font("bold").fontSize(8).fillColor("#333").text("Cautions.", m, 792 - m - 52, { width: w, continued: true }).font("body").text(` ${CAUTIONS.join(" ")}`);
  doc.end();
  return done;
}
