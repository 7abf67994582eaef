import Papa from "papaparse";

// A cell a spreadsheet would run as a formula gets a leading apostrophe; negative numbers stay numbers.
const FORMULA = /^([=+@\t\r]|-(?![\d.]))/;

/** A column of an exported list: its heading and how to read the value from a row. */
export interface CsvColumn<T> {
  header: string;
  value: (row: T) => string | number | boolean | null | undefined;
}

/** "Export current list": the rows on screen as a CSV file the browser downloads (UTF-8 with a byte-order mark for spreadsheets). */
export function downloadCsv<T>(fileName: string, columns: CsvColumn<T>[], rows: T[]) {
  const text = Papa.unparse(
    { fields: columns.map((c) => c.header), data: rows.map((r) => columns.map((c) => c.value(r) ?? "")) },
    { newline: "\r\n", escapeFormulae: FORMULA },
  );
  const blob = new Blob(["\uFEFF", text, "\r\n"], { type: "text/csv;charset=utf-8" });
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = fileName.endsWith(".csv") ? fileName : `${fileName}.csv`;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
