import { Link, useParams } from "react-router-dom";
import { isUsableForAcceptanceStatus, STATUS_LABELS } from "../../../../shared/tools/tool-status";
import { Cautions } from "../../../components/ui/cautions";
import { cx } from "../../../components/ui/cx";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { useToolStatus } from "../api/tool-status";

/**
 * The page a label's QR code opens on a phone at the bench: one answer,
 * USABLE or DO NOT USE, readable at arm's length, with the reason and due date.
 */
export function ToolStatusPage() {
  const { assetTag = "" } = useParams();
  const q = useToolStatus(assetTag);
  const s = q.data;
  // Usable for acceptance, usable with a notice, for reference only, or not at all (the shared status rules).
  const acceptance = !!s && isUsableForAcceptanceStatus(s.status);
  const referenceOnly = !!s && s.usable && !acceptance;
  const notice = s && s.usable && s.status !== "in_calibration";
  const verdict = !s ? "" : !s.usable ? "DO NOT USE" : referenceOnly ? "REFERENCE ONLY" : "USABLE";
  const tone = !s ? "bg-paper-sunk text-ink" : !s.usable ? "bg-stop text-white" : notice ? "bg-caution text-white" : "bg-go text-white";
  return (
    <main className="flex min-h-screen flex-col bg-paper">
      <header className={cx("px-5 pb-8 pt-6 text-center", tone)}>
        <p className="font-mono text-2xl font-bold tracking-wide">{s?.assetTag ?? assetTag.toUpperCase()}</p>
        {s?.description && <p className="text-base opacity-90">{s.description}</p>}
        {q.isPending && <p className="mt-6 text-3xl font-bold">Checking…</p>}
        {q.isError && (
          <p className="mt-6 text-3xl font-extrabold" role="alert">
            {q.error instanceof ApiError && q.error.status === 404 ? "No such tool" : "Cannot check now"}
          </p>
        )}
        {s && (
          <>
            <p className="mt-4 text-[3.5rem] font-black leading-none sm:text-7xl" role="status">
              <span aria-hidden="true">{!s.usable ? "✕ " : referenceOnly ? "! " : "✓ "}</span>
              {verdict}
            </p>
            <p className="mt-3 text-2xl font-bold">{referenceOnly ? "Not for acceptance readings" : STATUS_LABELS[s.status]}</p>
            {referenceOnly && <p className="mt-1 text-lg">For setting up and comparison only: no reading taken with it may accept a part.</p>}
          </>
        )}
      </header>
      <section className="flex-1 space-y-4 px-5 py-5 text-lg">
        {q.isError && <p>{errorMessage(q.error)}</p>}
        {s && (
          <>
            <div className="rounded-card border border-paper-line bg-paper-raised p-4">
              <p className="text-sm font-semibold uppercase tracking-wide text-ink-soft">{s.status === "overdue" ? "Calibration ran out" : "Calibration due"}</p>
              <p className="text-3xl font-bold">{s.dueAt ?? "—"}</p>
            </div>
            <div className="rounded-card border border-paper-line bg-paper-raised p-4">
              <p className="text-sm font-semibold uppercase tracking-wide text-ink-soft">{s.usable ? "Notes" : "Why not"}</p>
              <ul className="mt-1 space-y-1">
                {s.reasons.map((r) => (
                  <li key={r} className={cx(!s.usable && "font-semibold text-stop")}>
                    {r}
                  </li>
                ))}
              </ul>
            </div>
            {s.custodian && <p className="text-ink-soft">With {s.custodian.name}.</p>}
          </>
        )}
        <Cautions compact />
        <nav className="flex flex-wrap gap-4 pb-6 text-base">
          <Link to="/scan" className="font-semibold underline">
            Scan another tool
          </Link>
          <Link to="/" className="underline">
            Tenthwise home
          </Link>
        </nav>
      </section>
    </main>
  );
}
