import { useState } from "react";
import { Link } from "react-router-dom";
import { createColumnHelper } from "@tanstack/react-table";
import { STATUS_LABELS, TOOL_STATUSES } from "../../../../shared/tools/tool-status";
import { DUE_FILTERS, OWNER_TYPES, OWNER_TYPE_LABELS, type ToolSummary } from "../../../../shared/tools/tools.schemas";
import { useCan, useCurrentUser } from "../../auth/api/auth";
import { usePeople } from "../../users/api/users";
import { toolsCsvUrl, useToolLocations, useTools } from "../api/tools";
import { useAllFamilies } from "../api/families";
import { PageHeader, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { ButtonLink } from "../../../components/ui/button";
import { StatusBadge } from "../../../components/ui/status-badge";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { len } from "../lib/format";
import { DebouncedInput } from "./debounced-input";
import { FilterSelect } from "../../../components/ui/filter-select";

const FILTERS = ["q", "status", "usable", "familyId", "location", "custodianId", "custodianName", "ownerType", ...DUE_FILTERS] as const;
const PAGE_SIZE = 50;
// On a phone the register opens with the columns that answer "may I use it?"; the chooser brings back the rest.
const NARROW = () => window.matchMedia("(max-width: 639px)").matches;
const control = "rounded-md border border-paper-line bg-paper-raised px-2 py-1.5 min-h-10";

const col = createColumnHelper<ToolSummary>();
// Column ids that the server sorts by are the sort keys of ToolListQuerySchema.
const columns = [
  col.accessor("assetTag", {
    id: "assetTag",
    header: "Asset tag",
    cell: (c) => (
      <Link className="whitespace-nowrap font-semibold text-ink underline decoration-brass underline-offset-2" to={`/tools/${encodeURIComponent(c.getValue())}`}>
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("status", { id: "status", header: "Status", cell: (c) => <StatusBadge status={c.getValue()} /> }),
  col.accessor("dueAt", {
    id: "dueAt",
    header: "Due",
    cell: (c) => <span className={cx("whitespace-nowrap", c.row.original.status === "overdue" && "font-bold text-stop")}>{c.getValue() ?? "—"}</span>,
  }),
  col.accessor("description", { id: "description", header: "Description" }),
  col.accessor("familyName", { id: "family", header: "Family" }),
  col.accessor((t) => `${len(t.rangeMin, t.unit)} – ${len(t.rangeMax, t.unit)}`, { id: "range", header: "Range", enableSorting: false, cell: (c) => <span className="whitespace-nowrap">{c.getValue()}</span> }),
  col.accessor("resolution", { id: "resolution", header: "Resolution", enableSorting: false, cell: (c) => len(c.getValue(), c.row.original.unit) }),
  col.accessor("location", { id: "location", header: "Location" }),
  col.accessor((t) => t.custodian?.name ?? null, { id: "custodian", header: "Custodian" }),
  col.accessor((t) => (t.ownerType === "shop" ? "Shop" : `${OWNER_TYPE_LABELS[t.ownerType]}${t.ownerName ? `: ${t.ownerName}` : ""}`), { id: "owner", header: "Owner", enableSorting: false }),
  col.accessor("serialNumber", { id: "serialNumber", header: "Serial", enableSorting: false }),
  col.accessor((t) => [t.maker, t.model].filter(Boolean).join(" ") || null, { id: "makerModel", header: "Maker / model", enableSorting: false }),
];

export function RegisterPage() {
  const list = useListParams(FILTERS, { sort: "assetTag", pageSize: PAGE_SIZE });
  const f = list.filters;
  const user = useCurrentUser();
  const canAdd = useCan("tools.write");
  const families = useAllFamilies();
  const locations = useToolLocations();
  const query = {
    q: f.q,
    status: f.status,
    usable: f.usable,
    familyId: f.familyId,
    location: f.location,
    custodianId: f.custodianId,
    ownerType: f.ownerType,
    dueWithinDays: f.dueWithinDays,
    dueFrom: f.dueFrom,
    dueTo: f.dueTo,
    sort: list.sort,
  };
  const location = locationOptions(locations.data?.items ?? [], f.location);
  const due = dueFilterLabel(f);
  const tools = useTools({ ...query, page: list.page, pageSize: PAGE_SIZE });
  const filtered = FILTERS.some((k) => f[k]);

  return (
    <div>
      <PageHeader
        title="Tool register"
        subtitle="Every measuring tool, whether it may be used, and until when."
        actions={
          <>
            <a className="inline-flex min-h-10 items-center rounded-md border border-paper-line bg-paper-raised px-4 py-2 text-sm font-semibold hover:bg-paper-sunk" href={toolsCsvUrl(query)} download>
              Export CSV
            </a>
            {canAdd && (
              <ButtonLink variant="primary" to="/tools/new">
                Register a tool
              </ButtonLink>
            )}
          </>
        }
      />
      {tools.isError && <ErrorNote>{errorMessage(tools.error)}</ErrorNote>}
      <DataTable
        label="Tool register"
        columns={columns}
        {...pagedProps(tools, list, PAGE_SIZE)}
        sorting={list.sorting}
        onSortingChange={list.setSorting}
        loading={tools.isFetching}
        rowKey={(t) => t.id}
        initialHidden={NARROW() ? ["resolution", "serialNumber", "makerModel", "owner", "family", "range", "location", "custodian"] : ["resolution", "serialNumber", "makerModel", "owner"]}
        empty={<p className="text-center text-ink-faint">No tool matches these filters.</p>}
        toolbar={
          <>
            <DebouncedInput aria-label="Search tools" type="search" placeholder="Tag, description, serial" className={cx(control, "w-full sm:w-56")} value={f.q} onValue={(v) => list.setFilter("q", v)} />
            <select
              aria-label="Filter by status"
              className={control}
              value={f.usable === "false" ? "!usable" : f.status}
              onChange={(e) => list.update(e.target.value === "!usable" ? { status: null, usable: "false" } : { status: e.target.value, usable: null })}
            >
              <option value="">Any status</option>
              <option value="!usable">Any "do not use" status</option>
              {TOOL_STATUSES.map((s) => (
                <option key={s} value={s}>
                  {STATUS_LABELS[s]}
                </option>
              ))}
            </select>
            <select aria-label="Filter by family" className={cx(control, "max-w-[14rem]")} value={f.familyId} onChange={(e) => list.setFilter("familyId", e.target.value)}>
              <option value="">Any family</option>
              {(families.data?.items ?? []).map((fam) => (
                <option key={fam.id} value={fam.id}>
                  {fam.name}
                </option>
              ))}
            </select>
            <select aria-label="Filter by location" className={cx(control, "max-w-[12rem]")} value={location.value} onChange={(e) => list.setFilter("location", e.target.value)}>
              <option value="">Any location</option>
              {location.choices.map((l) => (
                <option key={l} value={l}>
                  {l}
                </option>
              ))}
            </select>
            <FilterSelect label="Filter by owner" className={control} all="Any owner" options={OWNER_TYPES} labels={OWNER_TYPE_LABELS} value={f.ownerType} onChange={(v) => list.setFilter("ownerType", v)} />
            {due && <FilterChip label="Due" value={due} clearLabel="Clear due-date filter" onClear={() => list.clearFilters(...DUE_FILTERS)} />}
            <CustodianFilter
              selected={f.custodianId ? { id: f.custodianId, name: f.custodianName || "selected person" } : null}
              onChange={(p) => list.update({ custodianId: p?.id ?? null, custodianName: p?.name ?? null })}
              me={{ id: user.id, name: user.name }}
            />
            {filtered && (
              <button type="button" className="text-sm underline" onClick={() => list.update(Object.fromEntries(FILTERS.map((k) => [k, null])))}>
                Clear filters
              </button>
            )}
          </>
        }
      />
    </div>
  );
}

/** An active filter the toolbar has no control for (set by a link or a pick), with its own clear button. */
function FilterChip({ label, value, clearLabel, onClear }: { label: string; value: string; clearLabel: string; onClear: () => void }) {
  return (
    <span role="group" aria-label={`${label} filter`} className="inline-flex min-h-10 items-center gap-2 rounded-md border border-brass/50 bg-brass-light/50 px-2 text-sm">
      {label}: <strong>{value}</strong>
      <button type="button" aria-label={clearLabel} className="min-h-8 min-w-8 px-1 font-bold" onClick={onClear}>
        ✕
      </button>
    </span>
  );
}

/** The due-date filter in words ("within 30 days", "2026-07-01 to 2026-07-31"), or null when none is set. */
function dueFilterLabel(f: Record<(typeof DUE_FILTERS)[number], string>): string | null {
  const parts: string[] = [];
  if (f.dueWithinDays) parts.push(f.dueWithinDays === "0" ? "today (still in calibration)" : `within ${f.dueWithinDays} day${f.dueWithinDays === "1" ? "" : "s"} (still in calibration)`);
  if (f.dueFrom && f.dueTo) parts.push(`${f.dueFrom} to ${f.dueTo}`);
  else if (f.dueFrom) parts.push(`from ${f.dueFrom}`);
  else if (f.dueTo) parts.push(`by ${f.dueTo}`);
  return parts.length ? parts.join(", ") : null;
}

/** Locations to choose from and the one chosen (the filter ignores case); a location in the address stays choosable even if no tool is there now. */
function locationOptions(known: string[], current: string): { choices: string[]; value: string } {
  const match = known.find((l) => l.toLowerCase() === current.toLowerCase());
  return current && !match ? { choices: [current, ...known], value: current } : { choices: known, value: match ?? "" };
}

/** Custodian filter: "in my custody" in one tap, or anyone found by name. */
function CustodianFilter({ selected, onChange, me }: { selected: { id: string; name: string } | null; onChange: (p: { id: string; name: string } | null) => void; me: { id: string; name: string } }) {
  const [q, setQ] = useState("");
  const people = usePeople(q);
  if (selected) return <FilterChip label="Custodian" value={selected.id === me.id ? "me" : selected.name} clearLabel="Clear custodian filter" onClear={() => onChange(null)} />;
  return (
    <span className="relative inline-flex items-center gap-2">
      <button type="button" className={cx(control, "text-sm")} onClick={() => onChange(me)}>
        In my custody
      </button>
      <input aria-label="Filter by custodian" placeholder="Custodian name" className={cx(control, "w-40")} value={q} onChange={(e) => setQ(e.target.value)} />
      {q.trim() && people.data && (
        <ul className="absolute left-0 top-full z-10 mt-1 max-h-60 w-64 overflow-auto rounded-md border border-paper-line bg-paper-raised shadow-card">
          {people.data.items.length === 0 && <li className="px-3 py-2 text-sm text-ink-faint">Nobody by that name.</li>}
          {people.data.items.map((p) => (
            <li key={p.id}>
              <button
                type="button"
                className="w-full px-3 py-2 text-left text-sm hover:bg-paper-sunk"
                onClick={() => {
                  onChange({ id: p.id, name: p.name });
                  setQ("");
                }}
              >
                {p.name} <span className="text-ink-faint">{p.email}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </span>
  );
}
