import type { ReactNode } from "react";
import { Link, useParams } from "react-router-dom";
import type { Chain } from "../../../../shared/calibrations/calibrations.schemas";
import { useChain } from "../api/calibrations";
import { PageHeader, ErrorNote, Loading, Facts } from "../../../components/ui/layout";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { len, when } from "../lib/format";
import { AccreditationBadge } from "../labs/labs-page";
import { ResultBadge } from "./result-badge";

type ChainLab = NonNullable<NonNullable<Chain["calibration"]>["lab"]>;

/** One link of the chain: a step name, what it is, and an arrow to the next. */
function Step({ step, title, children, last, tone = "normal" }: { step: string; title: ReactNode; children?: ReactNode; last?: boolean; tone?: "normal" | "gap" }) {
  return (
    <li className="relative pl-10">
      <span aria-hidden="true" className={cx("absolute left-0 top-1 grid size-7 place-items-center rounded-full text-xs font-bold", tone === "gap" ? "bg-stop text-white" : "bg-ink text-paper")}>
        {tone === "gap" ? "!" : last ? "●" : "↓"}
      </span>
      {!last && <span aria-hidden="true" className="absolute bottom-[-1rem] left-3.5 top-9 w-0.5 bg-brass" />}
      <div className={cx("rounded-card border p-3 shadow-card", tone === "gap" ? "border-stop/50 bg-stop-light" : "border-paper-line bg-paper-raised")}>
        <p className="text-xs font-semibold uppercase tracking-widest text-brass-dark">{step}</p>
        <div className="text-lg font-semibold">{title}</div>
        {children && <div className="mt-2">{children}</div>}
      </div>
    </li>
  );
}

function LabFacts({ lab }: { lab: ChainLab }) {
  return (
    <Facts
      items={[
        ["Accreditation", <AccreditationBadge key="a" state={lab.accreditation} />],
        ["Body", lab.accreditationBody],
        ["Number", lab.accreditationNumber],
        ["Expires", lab.accreditationExpiresAt],
        ["Scope", lab.scope],
      ]}
    />
  );
}

/** Traceability: tool → its calibration → standards used → their certificates → lab and accreditation → national measurement institute. */
export function ChainPage() {
  const { assetTag = "" } = useParams();
  const chain = useChain(assetTag);
  if (chain.isPending) return <Loading what="Tracing the chain" />;
  if (chain.isError) return <ErrorNote>{errorMessage(chain.error)}</ErrorNote>;
  const c = chain.data;
  const cal = c.calibration;
  return (
    <div className="max-w-3xl">
      <PageHeader
        title={`Traceability of ${c.tool.assetTag}`}
        subtitle="From the tool, through the calibration that counts now and the standards it used, to the national measurement institute."
        actions={
          <Link className="self-center text-sm underline" to={`/tools/${encodeURIComponent(c.tool.assetTag)}`}>
            Back to {c.tool.assetTag}
          </Link>
        }
      />
      {c.gaps.length > 0 && (
        <div role="alert" className="mb-4 rounded-md border border-stop/40 bg-stop-light px-3 py-2 text-stop">
          <strong>Gaps in the chain:</strong>
          <ul className="list-disc pl-5">
            {c.gaps.map((g) => (
              <li key={g}>{g}</li>
            ))}
          </ul>
        </div>
      )}
      <ol className="flex flex-col gap-4" aria-label="Traceability chain">
        <Step step="Tool" title={`${c.tool.assetTag} — ${c.tool.description}`}>
          <p className="text-sm">Serial {c.tool.serialNumber}</p>
        </Step>
        {!cal ? (
          <Step step="Calibration" title="No calibration counts now" tone="gap" last>
            <p className="text-sm">Without a calibration on record the chain stops at the tool.</p>
          </Step>
        ) : (
          <>
            <Step
              step="Calibration"
              title={
                <span className="flex flex-wrap items-center gap-2">
                  {when(cal.performedAt)} <ResultBadge result={cal.result} />
                </span>
              }
            >
              <Facts
                items={[
                  ["Performed", cal.source === "in_house" ? "In-house" : `By ${cal.lab?.name ?? "an outside lab"}`],
                  ["Next due", cal.nextDueAt],
                  [
                    "Certificate",
                    cal.source === "in_house" && !cal.certificateNumber ? (
                      "In-house record (this page is its traceability)"
                    ) : cal.certificateNumber || cal.hasCertificateFile ? (
                      <span>
                        {cal.certificateNumber}{" "}
                        {cal.hasCertificateFile && cal.certificateFileUrl && (
                          <a className="underline" href={cal.certificateFileUrl} target="_blank" rel="noreferrer">
                            Download
                          </a>
                        )}
                      </span>
                    ) : null,
                  ],
                ]}
              />
              {cal.lab && (
                <div className="mt-2 border-t border-paper-line pt-2">
                  <p className="mb-1 text-sm font-semibold">{cal.lab.name}</p>
                  <LabFacts lab={cal.lab} />
                </div>
              )}
            </Step>
            {c.standards.length === 0 && (
              <Step step="Reference standards" title={cal.source === "outside_lab" ? "Standards of the outside lab (on its certificate)" : "No standard named on the record"} tone={cal.source === "outside_lab" ? "normal" : "gap"} last />
            )}
            {c.standards.map((s, i) => {
              const cert = s.certificate;
              const last = i === c.standards.length - 1;
              return (
                <li key={s.id} className="list-none">
                  <ol className="flex flex-col gap-4">
                    <Step step="Reference standard" title={<Link className="underline" to={`/standards/${s.id}`}>{s.assetTag} — {s.name}</Link>} />
                    {!cert ? (
                      <Step step="Certificate" title="No certificate covered the calibration date" tone="gap" last={last} />
                    ) : (
                      <>
                        <Step step="Certificate" title={`Certificate ${cert.number}`}>
                          <Facts
                            items={[
                              ["Issued – due", `${cert.issuedAt} – ${cert.dueAt}`],
                              ["Expanded uncertainty", `U = ${len(cert.expandedUncertainty, s.unit)} (k = ${cert.coverageFactor})`],
                              [
                                "File",
                                cert.hasFile && cert.fileUrl ? (
                                  <a className="underline" href={cert.fileUrl} target="_blank" rel="noreferrer">
                                    Download certificate {cert.number}
                                  </a>
                                ) : (
                                  "No file attached"
                                ),
                              ],
                            ]}
                          />
                        </Step>
                        <Step step="Calibration lab and accreditation" title={cert.labName}>
                          {cert.lab ? <LabFacts lab={cert.lab} /> : <Facts items={[["Accreditation body", cert.accreditationBody], ["Scope", cert.scope]]} />}
                        </Step>
                        <Step step="National measurement institute" title={cert.nationalInstitute ?? "Not named on the certificate"} tone={cert.nationalInstitute ? "normal" : "gap"} last={last} />
                      </>
                    )}
                  </ol>
                </li>
              );
            })}
          </>
        )}
      </ol>
    </div>
  );
}
