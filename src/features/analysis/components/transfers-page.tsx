import { useState } from "react";
import { useCan } from "../../auth/api/auth";
import { Button } from "../../../components/ui/button";
import { Card, ErrorNote, PageHeader } from "../../../components/ui/layout";
import { Cautions } from "../../../components/ui/cautions";
import { errorMessage, ApiError } from "../../../lib/api-client";
import { IMPORT_FIELDS, IMPORT_FIELD_LABELS, REQUIRED_IMPORT_FIELDS, type CommitResult, type DryRunResult, type ImportError, type ImportMapping } from "../../../../shared/transfers/transfers.schemas";
import { sendImport, useAfterImport, type ImportProgress } from "../api/transfers";
import { downloadCsv } from "../lib/export-csv";
import { ScrollBox } from "../../../components/ui/scroll-box";

export function TransfersPage() {
  const canImport = useCan("import.run");
  return (
    <div className="flex flex-col gap-4">
      <PageHeader title="Import and export" subtitle="Bring in a shop's existing register from a spreadsheet; take the register and its full calibration history out as CSV." />
      <Card title="Export for an auditor">
        <p className="mb-3 text-sm text-ink-soft">
          CSV files (UTF-8) that open in any spreadsheet. The register lists every tool with the status it shows now; the history lists every calibration record, one line
          per check point, corrections and the records they supersede included.
        </p>
        <div className="flex flex-wrap gap-2">
          <a className="inline-flex min-h-10 items-center rounded-md bg-ink px-4 py-2 text-sm font-semibold text-paper hover:bg-ink-soft" href="/api/exports/register.csv" download>
            Download the register (CSV)
          </a>
          <a className="inline-flex min-h-10 items-center rounded-md border border-paper-line bg-paper-raised px-4 py-2 text-sm font-semibold hover:bg-paper-sunk" href="/api/exports/history.csv" download>
            Download calibration history (CSV)
          </a>
        </div>
      </Card>
      {canImport ? <ImportCard /> : <p className="text-sm text-ink-faint">Importing a register is for the quality manager and administrators.</p>}
      <Cautions compact />
    </div>
  );
}

const PHASES: Record<ImportProgress["phase"], string> = { uploading: "Uploading", validating: "Checking rows", importing: "Importing" };

function ImportCard() {
  const [file, setFile] = useState<File | null>(null);
  const [createFamilies, setCreateFamilies] = useState(false);
  const [mapping, setMapping] = useState<ImportMapping | undefined>();
  const [checked, setChecked] = useState<{ result: DryRunResult; mappingKey: string } | null>(null);
  const [progress, setProgress] = useState<ImportProgress | null>(null);
  const [error, setError] = useState<{ message: string; rows?: ImportError[] } | null>(null);
  const [done, setDone] = useState<CommitResult | null>(null);
  const afterImport = useAfterImport();
  const busy = progress !== null;
  const mappingKey = JSON.stringify([mapping ?? null, createFamilies]);
  const upToDate = checked?.mappingKey === mappingKey;

  async function run(step: "dry-run" | "commit") {
    if (!file) return;
    setError(null);
    setDone(null);
    setProgress({ phase: "uploading", fraction: 0 });
    try {
      if (step === "dry-run") {
        const result = await sendImport<DryRunResult>("dry-run", file, { mapping, createMissingFamilies: createFamilies }, setProgress);
        setMapping(result.mapping);
        setChecked({ result, mappingKey: JSON.stringify([result.mapping, createFamilies]) });
      } else {
        const result = await sendImport<CommitResult>("commit", file, { mapping, createMissingFamilies: createFamilies }, setProgress);
        setDone(result);
        setChecked(null);
        afterImport();
      }
    } catch (e) {
      const rows = e instanceof ApiError ? ((e.details as { errors?: ImportError[] } | undefined)?.errors ?? undefined) : undefined;
      setError({ message: errorMessage(e), rows });
    } finally {
      setProgress(null);
    }
  }

  const r = checked?.result;
  return (
    <Card title="Import a register from CSV">
      <ol className="mb-3 list-decimal pl-5 text-sm text-ink-soft">
        <li>Save the spreadsheet as CSV UTF-8, one tool per row, with a header row.</li>
        <li>Check the file: Tenthwise proposes which column fills which field and checks every row. Nothing is written.</li>
        <li>Import: every row in one go, or nothing. Last calibration dates become calibration records marked “imported from previous register”.</li>
      </ol>
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-1 text-sm font-semibold text-ink-soft">
          CSV file
          <input
            type="file"
            accept=".csv,text/csv"
            className="rounded-md border border-paper-line bg-paper-raised px-2 py-1.5 text-base font-normal"
            onChange={(e) => {
              setFile(e.target.files?.[0] ?? null);
              setMapping(undefined);
              setChecked(null);
              setDone(null);
              setError(null);
            }}
          />
        </label>
        <label className="flex min-h-10 items-center gap-2 text-sm">
          <input type="checkbox" checked={createFamilies} onChange={(e) => setCreateFamilies(e.target.checked)} />
          Create families the register does not have (needs kind and interval columns)
        </label>
        <Button variant="secondary" disabled={!file || busy} onClick={() => run("dry-run")}>
          {checked && !upToDate ? "Check again" : "Check the file"}
        </Button>
        <Button disabled={!file || busy || !r || !upToDate || r.errorCount > 0 || r.validRows === 0} onClick={() => run("commit")}>
          {r && upToDate && r.errorCount === 0 ? `Import ${r.validRows} tools` : "Import"}
        </Button>
      </div>
      {progress && <ProgressBar progress={progress} />}
      {error && (
        <div className="mt-3">
          <ErrorNote>{error.message}</ErrorNote>
          {error.rows && <ErrorTable errors={error.rows} />}
        </div>
      )}
      {done && (
        <p role="status" className="mt-3 rounded-md bg-go-light px-3 py-2 text-go">
          Imported {done.tools} tools{done.familiesCreated ? `, ${done.familiesCreated} new families` : ""} and {done.calibrations} last-calibration records. The audit trail records the import.
        </p>
      )}
      {r && (
        <div className="mt-4 flex flex-col gap-4">
          <p role="status" className={r.errorCount ? "font-semibold text-stop" : "font-semibold text-go"}>
            {r.rows} rows: {r.validRows} ready to import
            {r.errorCount ? `, ${r.errorCount} problem${r.errorCount === 1 ? "" : "s"} to fix first` : ""}
            {r.calibrationsToImport ? ` · ${r.calibrationsToImport} last-calibration dates` : ""}
            {r.familiesToCreate.length ? ` · new families: ${r.familiesToCreate.join(", ")}` : ""}
          </p>
          <MappingEditor columns={r.columns} mapping={mapping ?? {}} onChange={setMapping} />
          {r.errors.length > 0 && <ErrorTable errors={r.errors} total={r.errorCount} />}
          {r.preview.length > 0 && <Preview rows={r.preview} columns={r.columns} />}
        </div>
      )}
    </Card>
  );
}

function ProgressBar({ progress }: { progress: ImportProgress }) {
  const percent = Math.round(progress.fraction * 100);
  return (
    <div className="mt-3">
      <div className="mb-1 flex justify-between text-sm">
        <span>{PHASES[progress.phase]}…</span>
        <span className="tabular-nums">{percent} %</span>
      </div>
      <div role="progressbar" aria-label={PHASES[progress.phase]} aria-valuemin={0} aria-valuemax={100} aria-valuenow={percent} className="h-3 rounded-full bg-paper-sunk">
        <div className="h-3 rounded-full bg-brass transition-[width]" style={{ width: `${percent}%` }} />
      </div>
    </div>
  );
}

function MappingEditor({ columns, mapping, onChange }: { columns: string[]; mapping: ImportMapping; onChange: (m: ImportMapping) => void }) {
  return (
    <fieldset className="rounded-md border border-paper-line p-3">
      <legend className="px-1 text-sm font-semibold">Which column fills which field</legend>
      <div className="grid gap-2 sm:grid-cols-2 xl:grid-cols-3">
        {IMPORT_FIELDS.map((f) => (
          <label key={f} className="flex flex-col gap-1 text-sm">
            <span className="font-semibold text-ink-soft">
              {IMPORT_FIELD_LABELS[f]}
              {REQUIRED_IMPORT_FIELDS.includes(f) ? " *" : ""}
            </span>
            <select
              className="min-h-10 rounded-md border border-paper-line bg-paper-raised px-2"
              value={mapping[f] ?? ""}
              onChange={(e) => {
                const next = { ...mapping };
                if (e.target.value) next[f] = e.target.value;
                else delete next[f];
                onChange(next);
              }}
            >
              <option value="">— not imported —</option>
              {columns.map((c) => (
                <option key={c} value={c}>
                  {c}
                </option>
              ))}
            </select>
          </label>
        ))}
      </div>
      <p className="mt-2 text-xs text-ink-faint">* needed. After changing the mapping, check the file again before importing.</p>
    </fieldset>
  );
}

function ErrorTable({ errors, total }: { errors: ImportError[]; total?: number }) {
  return (
    <div>
      <div className="mb-1 flex items-center justify-between gap-2">
        <h3 className="font-semibold">
          Problems by row{total && total > errors.length ? ` (first ${errors.length} of ${total})` : ""}
        </h3>
        <Button
          variant="ghost"
          onClick={() =>
            downloadCsv("tenthwise-import-problems", [
              { header: "row", value: (e) => e.row },
              { header: "column", value: (e) => e.column },
              { header: "problem", value: (e) => e.message },
            ], errors)
          }
        >
          Export this list
        </Button>
      </div>
      <div className="max-h-80 overflow-auto rounded-md border border-paper-line">
        <table className="w-full text-left text-sm" aria-label="Problems by row">
          <thead className="sticky top-0 bg-paper-sunk text-xs uppercase text-ink-soft">
            <tr>
              <th className="px-2 py-1">Row</th>
              <th className="px-2 py-1">Column</th>
              <th className="px-2 py-1">Problem</th>
            </tr>
          </thead>
          <tbody>
            {errors.map((e, i) => (
              <tr key={i} className="border-t border-paper-line">
                <td className="px-2 py-1 tabular-nums">{e.row}</td>
                <td className="px-2 py-1">{e.column ?? "—"}</td>
                <td className="px-2 py-1">{e.message}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function Preview({ rows, columns }: { rows: Record<string, string | null>[]; columns: string[] }) {
  return (
    <details>
      <summary className="cursor-pointer text-sm font-semibold">First rows of the file</summary>
      <ScrollBox label="First rows of the file" className="mt-1">
        <table className="text-left text-xs" aria-label="First rows of the file">
          <thead className="bg-paper-sunk">
            <tr>
              {columns.map((c) => (
                <th key={c} className="px-2 py-1">
                  {c}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row, i) => (
              <tr key={i} className="border-t border-paper-line">
                {columns.map((c) => (
                  <td key={c} className="whitespace-nowrap px-2 py-1">
                    {row[c]}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollBox>
    </details>
  );
}
