import { Link, useParams } from "react-router-dom";
import { useLimitTable } from "../api/limit-tables";
import { PageHeader, Card, Facts, Loading, ErrorNote } from "../../../components/ui/layout";
import { ScrollBox } from "../../../components/ui/scroll-box";
import { ButtonLink } from "../../../components/ui/button";
import { Cautions, DemoNotice } from "../../../components/ui/cautions";
import { errorMessage } from "../../../lib/api-client";
import { useCan } from "../../auth/api/auth";
import { LIMIT_ITEM_KIND_LABELS, VERIFY_NOTICE, type LimitItemView } from "../../../../shared/limit-tables/limit-tables.schemas";
import { formatLimit, formatRange } from "./limit-format";
import { TableStudiesCard } from "../../studies/api/study-cards";
import { formatInstant } from "../../../lib/format";

/** Items grouped by their section, in table order. */
export function bySection<T extends { section: string | null }>(items: T[]): [string, T[]][] {
  const groups = new Map<string, T[]>();
  for (const it of items) groups.set(it.section ?? "General", [...(groups.get(it.section ?? "General") ?? []), it]);
  return [...groups.entries()];
}

export function LimitTablePage() {
  const { id } = useParams();
  const table = useLimitTable(id);
  const canWrite = useCan("limitTables.write");
  if (table.isPending) return <Loading />;
  if (table.isError) return <ErrorNote>{errorMessage(table.error)}</ErrorNote>;
  const t = table.data;
  const label = (k: string | null | undefined) => t.items.find((i) => i.key === k)?.label ?? k ?? "—";
  const describe = (it: LimitItemView) =>
    it.kind === "clearance"
      ? `${label(it.boreKey)} − ${label(it.journalKey)}; ${it.radial ? "RADIAL limits (half the diametral clearance)" : "diametral"}; loosest against the maximum, tightest against the minimum`
      : it.kind === "taper"
        ? `${label(it.stationKeys?.[0])} − ${label(it.stationKeys?.[1])}, same direction`
        : it.kind === "journal" || it.kind === "bore"
          ? [
              `every reading of ${it.directions} directions`,
              it.outOfRoundMax != null ? `out-of-round max ${formatLimit(it, it.outOfRoundMax, t.unit)}` : null,
              (it.expansionPerK ?? t.expansionPerK) != null ? `expansion ${Number(((it.expansionPerK ?? t.expansionPerK)! * 1e6).toFixed(3))} µm/(m·K)${it.expansionPerK != null ? "" : " (table)"}` : null,
            ]
              .filter(Boolean)
              .join("; ")
          : it.kind === "feeler"
            ? "go and no-go inside the limits"
            : "";
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title={t.name}
        subtitle={`${t.engineModel} — version ${t.version}`}
        actions={canWrite && !t.supersededById && <ButtonLink to={`/limit-tables/${t.id}/revise`}>Revise this table</ButtonLink>}
      />
      {t.isDemo && <DemoNotice what="limits" />}
      <p role="note" className="rounded-md border border-caution/40 bg-caution-light px-3 py-1.5 text-sm font-semibold text-caution">{VERIFY_NOTICE}</p>
      {t.supersededById && (
        <p className="text-sm">
          This version has been revised. <Link className="underline" to={`/limit-tables/${t.supersededById}`}>Open the newer version</Link>; jobs opened on this one keep it.
        </p>
      )}
      <Card>
        <Facts
          items={[
            ["Source document", t.sourceDocument],
            ["Revision", t.sourceRevision],
            ["Unit", t.unit === "in" ? "inch" : "millimetre"],
            ["Values", t.isDemo ? "Demo (invented)" : "Entered from the source document"],
            ["Parts' expansion", t.expansionPerK != null ? `${Number((t.expansionPerK * 1e6).toFixed(3))} µm/(m·K) — sizes with a part temperature are judged at 20 °C` : "not given"],
            ["Created", `${formatInstant(t.createdAt)}${t.createdBy ? ` by ${t.createdBy.name}` : ""}`],
          ]}
        />
      </Card>
      {bySection(t.items).map(([section, items]) => (
        <Card key={section} title={section}>
          <ScrollBox label={`Limits: ${section}`}>
            <table className="w-full text-left text-sm" aria-label={`Limits: ${section}`}>
              <thead className="text-xs uppercase text-ink-soft">
                <tr>
                  <th className="py-1 pr-3">Item</th>
                  <th className="py-1 pr-3">Kind</th>
                  <th className="py-1 pr-3">New limits ({t.unit})</th>
                  <th className="py-1 pr-3">Serviceable</th>
                  <th className="py-1 pr-3">Each engine</th>
                  <th className="py-1 pr-3">How</th>
                </tr>
              </thead>
              <tbody>
                {items.map((it) => (
                  <tr key={it.key} className="border-t border-paper-line align-top">
                    <td className="py-1.5 pr-3">
                      <span className="font-semibold">{it.label}</span>
                      <span className="block text-xs text-ink-faint">{it.key}</span>
                      {it.note && <span className="block text-xs text-ink-soft">{it.note}</span>}
                    </td>
                    <td className="py-1.5 pr-3">
                      {LIMIT_ITEM_KIND_LABELS[it.kind]}
                      {it.radial && <span className="ml-1 rounded bg-hold-light px-1 text-xs font-semibold text-hold">radial</span>}
                    </td>
                    <td className="py-1.5 pr-3 tabular-nums">{it.kind === "visual" ? "serviceable / reject" : formatRange(it, it.min, it.max, t.unit)}</td>
                    <td className="py-1.5 pr-3 tabular-nums">
                      {it.serviceableMin != null && `min ${formatLimit(it, it.serviceableMin, t.unit)} `}
                      {it.serviceableMax != null && `max ${formatLimit(it, it.serviceableMax, t.unit)}`}
                      {it.serviceableMin == null && it.serviceableMax == null && "—"}
                    </td>
                    <td className="py-1.5 pr-3">× {it.repeat}</td>
                    <td className="py-1.5 pr-3 text-xs">
                      {describe(it)}
                      {it.toolKinds?.length ? <span className="block">{it.toolKinds.join(", ").replace(/_/g, " ")}</span> : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollBox>
        </Card>
      ))}
      <TableStudiesCard limitTableId={t.id} />
      <Cautions />
    </div>
  );
}
