import { createRequire } from "node:module";
import PDFDocument from "pdfkit";

const require = createRequire(import.meta.url);
// The bundled Noto Sans: the same face as the screens, with every glyph the reports print.
const FONT = require.resolve("@fontsource/noto-sans/files/noto-sans-latin-400-normal.woff");
const FONT_BOLD = require.resolve("@fontsource/noto-sans/files/noto-sans-latin-700-normal.woff");

/**
 * A Letter-size PDF by Tenthwise with the fonts "body" and "bold" registered; `done` gives its bytes
 * once the writer calls `doc.end()`.
 */
export function newPdf(title: string, options: Omit<PDFKit.PDFDocumentOptions, "size" | "info"> = {}): { doc: PDFKit.PDFDocument; done: Promise<Buffer> } {
  const doc = new PDFDocument({ size: "LETTER", ...options, info: { Title: title, Author: "Tenthwise" } });
  doc.registerFont("body", FONT);
  doc.registerFont("bold", FONT_BOLD);
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  return { doc, done };
}

/** An instant as printed on reports: "2026-06-15 17:00" (with seconds: "17:00:09") in the shop's time zone. */
export function printedInstant(iso: string, timeZone: string, opts: { seconds?: boolean } = {}): string {
  return new Intl.DateTimeFormat("en-CA", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    ...(opts.seconds ? { second: "2-digit" } : {}),
    // h23, not hour12: false — Node 20 prints midnight as 24:05 with the latter.
    hourCycle: "h23",
  })
    .format(new Date(iso))
    .replace(",", "");
}
