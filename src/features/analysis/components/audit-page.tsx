import { useState } from "react";
import { Link } from "react-router-dom";
import { createColumnHelper } from "@tanstack/react-table";
import { useAudit, useAuditFacets } from "../api/audit";
import { usePeople } from "../../users/api/users";
import { Button } from "../../../components/ui/button";
import { ErrorNote, PageHeader } from "../../../components/ui/layout";
import { DataTable } from "../../../components/ui/data-table";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import type { AuditEvent } from "../../../../shared/audit/audit.schemas";
import { changeRows } from "../../../../shared/audit/changes";
import { downloadCsv } from "../lib/export-csv";
import { when } from "./format";

const FILTERS = ["actorId", "actorName", "entityType", "entityId", "from", "to"] as const;
const PAGE_SIZE = 50;
const col = createColumnHelper<AuditEvent>();

/** The CSV keeps each side as JSON, for a spreadsheet or a script; the page shows it field by field. */
const json = (v: unknown) => (v == null ? "" : JSON.stringify(v));

const columns = [
  col.accessor("at", { header: "When", cell: (c) => <span className="whitespace-nowrap">{when(c.getValue())}</span> }),
  col.accessor("actorName", { header: "Who", cell: (c) => c.getValue() ?? (c.row.original.actorId ? "A person no longer on record" : "Tenthwise (scheduled job)") }),
  col.accessor("actionLabel", { header: "What" }),
  col.accessor("entityTypeLabel", { header: "Record type" }),
  col.accessor("record", {
    header: "Record",
    cell: (c) => {
      const r = c.getValue();
      if (!r) return <span className="text-ink-soft">No longer on record</span>;
      return r.path ? (
        <Link className="font-semibold underline" to={r.path}>
          {r.title}
        </Link>
      ) : (
        r.title
      );
    },
  }),
  col.display({
    id: "change",
    header: "Change",
    cell: (c) => {
      const e = c.row.original;
      if (e.before == null && e.after == null) return "—";
      const rows = changeRows(e.before, e.after);
      return (
        <details className="max-w-md">
          <summary className="cursor-pointer text-sm underline">Details</summary>
          <table className="mt-1 text-xs" aria-label={`Change: ${e.actionLabel}`}>
            <thead>
              <tr className="text-left text-ink-soft">
                <th className="py-0.5 pr-3 font-semibold">Field</th>
                {e.before != null && <th className="py-0.5 pr-3 font-semibold">Before</th>}
                {e.after != null && <th className="py-0.5 font-semibold">{e.before != null ? "After" : "Recorded"}</th>}
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.field} className={r.changed ? "font-semibold" : undefined}>
                  <th scope="row" className="py-0.5 pr-3 text-left font-normal text-ink-soft">
                    {r.field}
                  </th>
                  {e.before != null && <td className="py-0.5 pr-3 break-words">{r.before ?? "—"}</td>}
                  {e.after != null && <td className="py-0.5 break-words">{r.after ?? "—"}</td>}
                </tr>
              ))}
            </tbody>
          </table>
        </details>
      );
    },
  }),
];

/** Who did what and when: read-only, filtered and paged on the server. */
export function AuditPage() {
  const list = useListParams(FILTERS, { pageSize: PAGE_SIZE });
  const f = list.filters;
  // "Next" reads on from the last line shown, by keyset (cursorFromPageBefore), however far back the trail goes.
  const q = useAudit({ actorId: f.actorId || undefined, entityType: f.entityType || undefined, entityId: f.entityId || undefined, from: f.from || undefined, to: f.to || undefined, page: list.page, pageSize: PAGE_SIZE });
  const facets = useAuditFacets();
  const rows = q.data?.items ?? [];
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Audit trail"
        subtitle="Every change to the register and its records: who, what and when. Lines are only ever added."
        actions={
          <Button
            variant="secondary"
            disabled={!rows.length}
            onClick={() =>
              downloadCsv("tenthwise-audit-trail", [
                { header: "at", value: (e) => e.at },
                { header: "who", value: (e) => e.actorName },
                { header: "action", value: (e) => e.action },
                { header: "what", value: (e) => e.actionLabel },
                { header: "recordType", value: (e) => e.entityType },
                { header: "record", value: (e) => e.entityId },
                { header: "recordName", value: (e) => e.record?.title ?? "" },
                { header: "before", value: (e) => json(e.before) },
                { header: "after", value: (e) => json(e.after) },
              ], rows)
            }
          >
            Export this page
          </Button>
        }
      />
      {q.isError && <ErrorNote>{errorMessage(q.error)}</ErrorNote>}
      <DataTable
        label="Audit trail"
        columns={columns}
        data={rows}
        total={q.data?.total ?? 0}
        totalCapped={q.data?.totalCapped}
        hasMore={q.data ? q.data.nextCursor != null : undefined}
        page={list.page}
        pageSize={PAGE_SIZE}
        onPageChange={list.setPage}
        loading={q.isPending}
        rowKey={(e) => String(e.id)}
        toolbar={
          <>
            <PersonFilter actorId={f.actorId} actorName={f.actorName} onPick={(id, name) => list.update({ actorId: id, actorName: name })} />
            <select aria-label="Record type" className="min-h-10 rounded-md border border-paper-line px-2" value={f.entityType} onChange={(e) => list.setFilter("entityType", e.target.value)}>
              <option value="">Every record type</option>
              {(facets.data?.entityTypeOptions ?? []).map((t) => (
                <option key={t.value} value={t.value}>
                  {t.label}
                </option>
              ))}
            </select>
            <input aria-label="Record (asset tag or id)" placeholder="Record (tag or id)" className="min-h-10 rounded-md border border-paper-line px-3" defaultValue={f.entityId} onBlur={(e) => list.setFilter("entityId", e.target.value.trim())} onKeyDown={(e) => e.key === "Enter" && list.setFilter("entityId", (e.target as HTMLInputElement).value.trim())} />
            <label className="flex items-center gap-1 text-sm">
              From
              <input type="date" aria-label="From date" className="min-h-10 rounded-md border border-paper-line px-2" value={f.from} onChange={(e) => list.setFilter("from", e.target.value)} />
            </label>
            <label className="flex items-center gap-1 text-sm">
              To
              <input type="date" aria-label="To date" className="min-h-10 rounded-md border border-paper-line px-2" value={f.to} onChange={(e) => list.setFilter("to", e.target.value)} />
            </label>
          </>
        }
      />
    </div>
  );
}

function PersonFilter({ actorId, actorName, onPick }: { actorId: string; actorName: string; onPick: (id: string | null, name: string | null) => void }) {
  const [text, setText] = useState("");
  const people = usePeople(text);
  if (actorId) {
    return (
      <span className="inline-flex min-h-10 items-center gap-2 rounded-md border border-paper-line px-3 text-sm">
        Person: <strong>{actorName || "selected"}</strong>
        <button type="button" className="underline" onClick={() => onPick(null, null)} aria-label="Clear the person filter">
          clear
        </button>
      </span>
    );
  }
  return (
    <div className="relative">
      <input aria-label="Person" placeholder="Person (name or e-mail)" className="min-h-10 rounded-md border border-paper-line px-3" value={text} onChange={(e) => setText(e.target.value)} />
      {text.trim() && (people.data?.items.length ?? 0) > 0 && (
        <ul className="absolute z-10 mt-1 w-64 rounded-md border border-paper-line bg-paper-raised shadow-card" role="listbox" aria-label="People">
          {people.data!.items.map((p) => (
            <li key={p.id}>
              <button
                type="button"
                role="option"
                aria-selected={false}
                className="block w-full px-3 py-2 text-left text-sm hover:bg-paper"
                onClick={() => {
                  onPick(p.id, p.name);
                  setText("");
                }}
              >
                {p.name} <span className="text-ink-faint">{p.email}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
