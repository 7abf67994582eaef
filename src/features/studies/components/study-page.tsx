import { lazy, Suspense } from "react";
import { Link, useParams } from "react-router-dom";
import { useStudy } from "../api/studies";
import { StudyVerdictBadge } from "../api/study-cards";
import { PageHeader, Card, Facts, Loading, ErrorNote } from "../../../components/ui/layout";
import { ScrollBox } from "../../../components/ui/scroll-box";
import { Cautions, DemoNotice } from "../../../components/ui/cautions";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { COMPONENT_LABELS } from "../../../../shared/studies/study-labels";
import type { StudyAnalysis, StudyDetail } from "../../../../shared/studies/studies.schemas";
import { formatDateTime } from "../../../lib/format";

// The charts (and recharts with them) load only when a finished study's page opens.
const StudyCharts = lazy(() => import("./study-charts"));

const LETTERS = "ABC";
const fmt = (x: number | null | undefined, digits = 6) => (x == null || !Number.isFinite(x) ? "—" : Number(x.toPrecision(digits)).toString());
const pct = (x: number | null | undefined) => (x == null ? "—" : `${x.toFixed(1)} %`);
/** Squares of small lengths (in²) read better as powers of ten. */
const sci = (x: number | null | undefined) => (x != null && x !== 0 && Math.abs(x) < 1e-3 ? x.toExponential(3) : fmt(x));

export function StudyPage() {
  const { id = "" } = useParams();
  const q = useStudy(id);
  if (q.isPending) return <Loading what="Opening the study" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const s = q.data;
  const c = s.characteristic;
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title={`${s.reference} — ${c.label}`}
        subtitle={`${c.engineModel} · ${s.tool ? `${s.tool.assetTag} (${s.family.name})` : s.family.name} · ${s.parts} parts × ${s.appraisers.length} appraisers × ${s.trials} trials`}
        actions={
          <>
            <a className="inline-flex min-h-10 items-center rounded-md border border-paper-line bg-paper-raised px-4 py-2 text-sm font-semibold hover:bg-paper-sunk" href={`/api/studies/${s.id}/report.pdf`} target="_blank" rel="noreferrer">
              Report (PDF)
            </a>
            <Link className="self-center text-sm underline" to="/studies">
              All studies
            </Link>
          </>
        }
      />
      {s.isDemo && <DemoNotice what="study" />}
      <div className="grid gap-4 lg:grid-cols-2">
        <Card title="Set-up">
          <Facts
            items={[
              ["Characteristic", <Link key="c" className="underline" to={`/limit-tables/${c.limitTableId}`}>{`${c.label} (${c.tableName}, v${c.tableVersion})`}</Link>],
              ["Limits", `${c.min} – ${c.max} ${c.unit} (tolerance ${fmt(c.tolerance)} ${c.unit})`],
              ["Measuring system", s.tool ? `${s.tool.assetTag} — ${s.tool.description}` : `Any tool of ${s.family.name}`],
              ["Appraisers", s.appraisers.map((a, i) => `${LETTERS[i]}: ${a.name}`).join(" · ")],
              ["Parts", s.partLabels.join(", ")],
              ["Interaction pooled when p >", String(s.alpha)],
              ["Set up", `${s.createdAt.slice(0, 10)}${s.createdBy ? ` by ${s.createdBy.name}` : ""}`],
              ["Purpose", s.purpose],
            ]}
          />
        </Card>
        <Card title="Progress">
          <ul className="flex flex-col gap-2 text-sm" aria-label="Progress by appraiser">
            {s.progress.map((p, i) => (
              <li key={p.appraiser.id}>
                <div className="flex justify-between">
                  <span>
                    {LETTERS[i]}: {p.appraiser.name}
                  </span>
                  <span className="tabular-nums">
                    {p.taken} of {p.needed}
                  </span>
                </div>
                <div className="mt-1 h-2 rounded bg-paper-sunk">
                  <div className="h-2 rounded bg-ink" style={{ width: `${(100 * p.taken) / p.needed}%` }} />
                </div>
              </li>
            ))}
          </ul>
          <p className="mt-3 text-sm text-ink-soft">
            {s.state === "complete" ? `Finished ${s.completedAt?.slice(0, 10)}.` : "Results appear when every appraiser has measured every part in every trial. Values stay hidden from the appraisers while they measure."}
          </p>
        </Card>
      </div>
      {s.analysis && <Results s={s} a={s.analysis} />}
      <ValuesCard s={s} />
      <Cautions />
    </div>
  );
}

function Results({ s, a }: { s: StudyDetail; a: StudyAnalysis }) {
  const v = a.anova.verdict;
  const tone = v.verdict === "acceptable" ? "border-go/50 bg-go-light text-go" : v.verdict === "conditional" ? "border-caution/50 bg-caution-light text-caution" : "border-stop/50 bg-stop-light text-stop";
  const u = a.unit;
  return (
    <>
      <section aria-label="Verdict" className={cx("rounded-card border-2 p-4", tone)}>
        <div className="flex flex-wrap items-center gap-3">
          <StudyVerdictBadge verdict={v.verdict} long />
          <span className="text-lg font-bold">
            GRR {pct(v.percentGrr)} of the {v.basis === "tolerance" ? "tolerance" : "total variation"} · ndc {a.anova.ndc ?? "—"}
          </span>
        </div>
        <ul className="mt-2 list-disc pl-5 text-sm text-ink">
          {v.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
        <p className="mt-1 text-xs text-ink-soft">Bands (AIAG MSA 4th ed.): below 10 % acceptable; 10–30 % may be acceptable for some uses; above 30 % not acceptable; at least 5 distinct categories.</p>
      </section>

      <div className="grid gap-4 xl:grid-cols-[3fr_2fr]">
        <Card title="ANOVA method">
          <p className="mb-2 text-sm">
            Two-way random effects, parts × appraisers. Interaction p = {fmt(a.anova.pInteraction, 4)} against α = {a.anova.alpha}:{" "}
            <strong>{a.anova.pooled ? "pooled into repeatability" : "kept in the model"}</strong>.
            {a.anova.negativeSetToZero.length > 0 && ` Negative estimates set to zero: ${a.anova.negativeSetToZero.join(", ")}.`}
          </p>
          <ScrollBox label="Analysis of variance">
            <table className="w-full text-right text-sm tabular-nums [&_td]:pl-3 [&_td]:whitespace-nowrap [&_th]:pl-3" aria-label="Analysis of variance">
              <thead className="text-xs uppercase text-ink-soft">
                <tr>
                  <th className="py-1 text-left">Source</th>
                  <th>df</th>
                  <th>SS</th>
                  <th>MS</th>
                  <th>F</th>
                  <th>p</th>
                </tr>
              </thead>
              <tbody>
                {a.anova.table.map((r) => (
                  <tr key={r.source} className="border-t border-paper-line">
                    <td className="py-1 text-left !whitespace-normal">{r.source === "repeatability" ? (a.anova.pooled ? "Repeatability (with interaction)" : "Repeatability") : r.source === "interaction" ? "Appraiser × part" : r.source[0].toUpperCase() + r.source.slice(1)}</td>
                    <td>{r.df}</td>
                    <td>{sci(r.ss)}</td>
                    <td>{sci(r.ms)}</td>
                    <td>{fmt(r.f, 4)}</td>
                    <td>{r.p == null ? "" : fmt(r.p, 3)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollBox>
          <ScrollBox label="Variance components" className="mt-3">
            <table className="w-full text-right text-sm tabular-nums [&_td]:pl-3 [&_td]:whitespace-nowrap [&_th]:pl-3" aria-label="Variance components">
              <thead className="text-xs uppercase text-ink-soft">
                <tr>
                  <th className="py-1 text-left">Component</th>
                  <th>Variance</th>
                  <th>σ ({u})</th>
                  <th>% contribution</th>
                  <th>% of TV</th>
                  <th>% of tolerance</th>
                </tr>
              </thead>
              <tbody>
                {a.anova.components.map((k) => (
                  <tr key={k.key} className={cx("border-t border-paper-line", k.key === "grr" && "font-semibold")}>
                    <td className="py-1 text-left !whitespace-normal">{COMPONENT_LABELS[k.key]}</td>
                    <td>{sci(k.variance)}</td>
                    <td>{fmt(k.sd)}</td>
                    <td>{pct(k.percentContribution)}</td>
                    <td>{pct(k.percentTotalVariation)}</td>
                    <td>{pct(k.percentTolerance)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollBox>
          <p className="mt-2 text-sm">Number of distinct categories: <strong>{a.anova.ndc ?? "—"}</strong> (1.41 · σ part / σ GRR, truncated).</p>
        </Card>
        <Card title="Average-and-range method">
          <Facts
            items={[
              ["R̄ by appraiser", a.averageRange.rangeByAppraiser.map((r, i) => `${LETTERS[i]} ${fmt(r, 4)}`).join(" · ")],
              ["R̿", fmt(a.averageRange.rBarBar)],
              ["X̄ by appraiser", a.averageRange.averageByAppraiser.map((r, i) => `${LETTERS[i]} ${fmt(r, 5)}`).join(" · ")],
              ["X̄diff / Rp", `${fmt(a.averageRange.xBarDiff)} / ${fmt(a.averageRange.partRange)}`],
              ["K1 / K2 / K3", `${a.averageRange.constants.K1} / ${a.averageRange.constants.K2} / ${a.averageRange.constants.K3}`],
              [`EV / AV (${u})`, `${fmt(a.averageRange.ev)} / ${fmt(a.averageRange.av)}`],
              [`GRR / PV / TV (${u})`, `${fmt(a.averageRange.grr)} / ${fmt(a.averageRange.pv)} / ${fmt(a.averageRange.tv)}`],
              ["GRR", `${pct(a.averageRange.components.find((x) => x.key === "grr")!.percentTotalVariation)} of TV · ${pct(a.averageRange.components.find((x) => x.key === "grr")!.percentTolerance)} of tolerance`],
              ["ndc", a.averageRange.ndc ?? "—"],
              ["Verdict by this method", <StudyVerdictBadge key="v" verdict={a.averageRange.verdict.verdict} />],
            ]}
          />
          <p className="mt-2 text-xs text-ink-faint">The average-and-range method cannot separate an appraiser × part interaction; the verdict of record is the ANOVA's.</p>
        </Card>
      </div>
      <Suspense fallback={<Loading what="Drawing the charts" />}>
        <StudyCharts s={s} a={a} />
      </Suspense>
    </>
  );
}

function ValuesCard({ s }: { s: StudyDetail }) {
  const rows = [...s.values].sort((x, y) => x.appraiser.name.localeCompare(y.appraiser.name) || x.position - y.position || x.takenAt.localeCompare(y.takenAt));
  return (
    <Card title={`Values as taken (${s.values.length})`}>
      {rows.length === 0 ? (
        <p className="text-sm text-ink-faint">No value yet.</p>
      ) : (
        <ScrollBox label="Values as taken" className="max-h-96 overflow-auto">
          <table className="w-full text-left text-sm" aria-label="Values as taken">
            <thead className="sticky top-0 bg-paper-raised text-xs uppercase text-ink-soft">
              <tr>
                <th className="py-1 pr-2">Appraiser</th>
                <th className="pr-2">Order</th>
                <th className="pr-2">Part</th>
                <th className="pr-2">Trial</th>
                <th className="pr-2 text-right">Value</th>
                <th className="pr-2">Tools (status then)</th>
                <th>Taken</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((v) => (
                <tr key={v.id} className={cx("border-t border-paper-line", v.supersededById && "text-ink-faint line-through")}>
                  <td className="py-1 pr-2">{v.appraiser.name}</td>
                  <td className="pr-2">{v.position}</td>
                  <td className="pr-2">{v.partLabel}</td>
                  <td className="pr-2">{v.trial}</td>
                  <td className="pr-2 text-right tabular-nums">
                    {v.value} {v.unit}
                  </td>
                  <td className="pr-2 text-xs">{v.tools.map((t) => `${t.assetTag} (${t.statusAtReading.replace(/_/g, " ")})`).join(", ")}</td>
                  <td className="text-xs">
                    {formatDateTime(v.takenAt)}
                    {v.supersedeReason && <span className="block no-underline">Correction: {v.supersedeReason}</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollBox>
      )}
    </Card>
  );
}
