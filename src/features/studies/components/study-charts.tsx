import { Bar, BarChart, CartesianGrid, Legend, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { Card } from "../../../components/ui/layout";
import type { StudyAnalysis, StudyDetail } from "../../../../shared/studies/studies.schemas";

// Appraisers differ by colour and by line pattern, so the charts read without colour too.
const COLOURS = ["#1f2f3d", "#b8862f", "#2f7a4f"];
const DASHES = ["", "6 3", "2 2"];
const LETTERS = "ABC";
const tick = { fontSize: 11, fill: "#3b4d5e" };
const num = (v: number) => Number(v.toPrecision(3)).toString();
/** Sizes near a nominal need more digits than ranges do (0.8747 in, not 0.875). */
const size = (v: number) => Number(v.toPrecision(5)).toString();

/** Range and average charts by appraiser, the appraiser × part interaction plot and the components bars. */
export default function StudyCharts({ s, a }: { s: StudyDetail; a: StudyAnalysis }) {
  const parts = s.parts;
  const n = s.appraisers.length;
  const u = a.unit;
  // Appraiser A's parts first, then B's, then C's, on one axis.
  const series = (pts: { appraiser: number; part: number; value: number }[]) =>
    s.appraisers.map((ap, j) => ({ name: `${LETTERS[j]}: ${ap.name}`, data: pts.filter((p) => p.appraiser === j).map((p) => ({ x: j * parts + p.part + 1, y: p.value, label: `${s.partLabels[p.part]}` })) }));
  const xTicks = Array.from({ length: parts * n }, (_, i) => i + 1);
  const xFmt = (x: number) => `${LETTERS[Math.floor((x - 1) / parts)] ?? ""}${((x - 1) % parts) + 1}`;
  const partNo = (x: number) => String(((x - 1) % parts) + 1);
  // One band per appraiser, named at its left edge.
  const dividers = Array.from({ length: n }, (_, j) => ({ x: j * parts + 0.5, label: LETTERS[j] }));

  const rangeLabel = `Range chart by appraiser: R̿ ${num(a.charts.range.center)}, upper limit ${num(a.charts.range.ucl)} ${u}; ${
    a.charts.range.beyondLimits.length ? `above the limit: ${a.charts.range.beyondLimits.map((p) => `appraiser ${LETTERS[p.appraiser]} ${s.partLabels[p.part]} ${num(p.value)}`).join(", ")}` : "no range above the limit"
  }.`;
  const avgLabel = `Average chart by appraiser: limits ${size(a.charts.average.lcl)} to ${size(a.charts.average.ucl)} ${u}; ${a.charts.average.percentBeyond.toFixed(0)} % of part averages outside them.`;
  const interaction = a.charts.interaction.map((p) => ({ part: p.part + 1, label: s.partLabels[p.part], ...Object.fromEntries(p.byAppraiser.map((v, j) => [`a${j}`, v])) }));
  const keys = ["grr", "repeatability", "reproducibility", "part"] as const;
  const names = { grr: "Gauge R&R", repeatability: "Repeatability", reproducibility: "Reproducibility", part: "Part-to-part" };
  const bars = keys.map((k) => {
    const c = a.anova.components.find((x) => x.key === k)!;
    return { name: names[k], contribution: c.percentContribution ?? 0, tv: c.percentTotalVariation ?? 0, tolerance: c.percentTolerance ?? 0 };
  });

  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <Card title="Range chart by appraiser">
        <div className="h-64" role="img" aria-label={rangeLabel}>
          <ResponsiveContainer width="100%" height="100%">
            <LineChart margin={{ top: 8, right: 12, bottom: 0, left: 4 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#d6d0c4" />
              <XAxis dataKey="x" type="number" domain={[0.5, parts * n + 0.5]} ticks={xTicks} tickFormatter={partNo} tick={tick} interval={0} />
              <YAxis tick={tick} width={56} tickFormatter={num} domain={[0, (max: number) => Math.max(max, a.charts.range.ucl) * 1.1]} />
              {dividers.map((d) => (
                <ReferenceLine key={d.x} x={d.x} stroke="#9aa5b0" label={{ value: d.label, fontSize: 11, fontWeight: 700, fill: "#3b4d5e", position: "insideTopLeft" }} />
              ))}
              <ReferenceLine y={a.charts.range.ucl} stroke="#b3261e" strokeDasharray="4 3" label={{ value: `UCL ${num(a.charts.range.ucl)}`, fontSize: 10, fill: "#b3261e", position: "insideTopRight" }} />
              <ReferenceLine y={a.charts.range.center} stroke="#6b7c8c" label={{ value: `R̿ ${num(a.charts.range.center)}`, fontSize: 10, fill: "#3b4d5e", position: "insideBottomRight" }} />
              <Tooltip formatter={(v) => [`${num(Number(v))} ${u}`, "Range"]} labelFormatter={(x) => xFmt(Number(x))} />
              <Legend wrapperStyle={{ fontSize: 12 }} />
              {series(a.charts.range.points).map((sr, j) => (
                <Line key={sr.name} data={sr.data} dataKey="y" name={sr.name} stroke={COLOURS[j]} strokeDasharray={DASHES[j]} strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} />
              ))}
            </LineChart>
          </ResponsiveContainer>
        </div>
        <p className="mt-1 text-xs text-ink-soft">A range above the upper limit means that appraiser read the same part inconsistently; look at the method before the tool.</p>
      </Card>
      <Card title="Average chart by appraiser">
        <div className="h-64" role="img" aria-label={avgLabel}>
          <ResponsiveContainer width="100%" height="100%">
            <LineChart margin={{ top: 8, right: 12, bottom: 0, left: 4 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#d6d0c4" />
              <XAxis dataKey="x" type="number" domain={[0.5, parts * n + 0.5]} ticks={xTicks} tickFormatter={partNo} tick={tick} interval={0} />
              <YAxis tick={tick} width={56} tickFormatter={size} domain={["auto", "auto"]} />
              {dividers.map((d) => (
                <ReferenceLine key={d.x} x={d.x} stroke="#9aa5b0" label={{ value: d.label, fontSize: 11, fontWeight: 700, fill: "#3b4d5e", position: "insideTopLeft" }} />
              ))}
              <ReferenceLine y={a.charts.average.ucl} stroke="#b3261e" strokeDasharray="4 3" label={{ value: `UCL ${size(a.charts.average.ucl)}`, fontSize: 10, fill: "#b3261e", position: "insideTopRight" }} />
              <ReferenceLine y={a.charts.average.lcl} stroke="#b3261e" strokeDasharray="4 3" label={{ value: `LCL ${size(a.charts.average.lcl)}`, fontSize: 10, fill: "#b3261e", position: "insideBottomRight" }} />
              <Tooltip formatter={(v) => [`${size(Number(v))} ${u}`, "Average"]} labelFormatter={(x) => xFmt(Number(x))} />
              <Legend wrapperStyle={{ fontSize: 12 }} />
              {series(a.charts.average.points).map((sr, j) => (
                <Line key={sr.name} data={sr.data} dataKey="y" name={sr.name} stroke={COLOURS[j]} strokeDasharray={DASHES[j]} strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} />
              ))}
            </LineChart>
          </ResponsiveContainer>
        </div>
        <p className="mt-1 text-xs text-ink-soft">Here most points should fall outside the limits: the limits come from the gauge's own variation, so averages outside them show it can see the parts differ.</p>
      </Card>
      <Card title="Appraiser × part interaction">
        <div className="h-64" role="img" aria-label={`Each appraiser's average per part (${u}); lines that cross or spread show an appraiser × part interaction (p = ${a.anova.pInteraction.toPrecision(3)}).`}>
          <ResponsiveContainer width="100%" height="100%">
            <LineChart data={interaction} margin={{ top: 8, right: 12, bottom: 0, left: 4 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#d6d0c4" />
              <XAxis dataKey="part" tick={tick} interval={0} />
              <YAxis tick={tick} width={56} tickFormatter={size} domain={["auto", "auto"]} />
              <Tooltip formatter={(v) => `${size(Number(v))} ${u}`} labelFormatter={(p) => s.partLabels[Number(p) - 1] ?? String(p)} />
              <Legend wrapperStyle={{ fontSize: 12 }} />
              {s.appraisers.map((ap, j) => (
                <Line key={ap.id} dataKey={`a${j}`} name={`${LETTERS[j]}: ${ap.name}`} stroke={COLOURS[j]} strokeDasharray={DASHES[j]} strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} />
              ))}
            </LineChart>
          </ResponsiveContainer>
        </div>
      </Card>
      <Card title="Components of variation">
        <div className="h-64" role="img" aria-label={`Components (ANOVA): ${bars.map((b) => `${b.name} ${b.contribution.toFixed(1)} % contribution, ${b.tv.toFixed(1)} % of total variation, ${b.tolerance.toFixed(1)} % of tolerance`).join("; ")}.`}>
          <ResponsiveContainer width="100%" height="100%">
            <BarChart data={bars} margin={{ top: 8, right: 12, bottom: 0, left: -8 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#d6d0c4" vertical={false} />
              <XAxis dataKey="name" tick={tick} interval={0} />
              <YAxis tick={tick} unit=" %" />
              <ReferenceLine y={10} stroke="#2f7a4f" strokeDasharray="4 3" />
              <ReferenceLine y={30} stroke="#b3261e" strokeDasharray="4 3" />
              <Tooltip formatter={(v) => `${Number(v).toFixed(1)} %`} />
              <Legend wrapperStyle={{ fontSize: 12 }} />
              <Bar dataKey="contribution" name="% contribution" fill="#1f2f3d" isAnimationActive={false} />
              <Bar dataKey="tv" name="% of total variation" fill="#b8862f" isAnimationActive={false} />
              <Bar dataKey="tolerance" name="% of tolerance" fill="#5b4a8b" isAnimationActive={false} />
            </BarChart>
          </ResponsiveContainer>
        </div>
        <p className="mt-1 text-xs text-ink-soft">Dashed lines at 10 % and 30 %: the bands of the verdict.</p>
      </Card>
    </div>
  );
}
