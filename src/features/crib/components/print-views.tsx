import { useParams, useSearchParams } from "react-router-dom";
import { STATUS_LABELS } from "../../../../shared/tools/tool-status";
import { ErrorNote, Loading } from "../../../components/ui/layout";
import { Cautions } from "../../../components/ui/cautions";
import { Button } from "../../../components/ui/button";
import { errorMessage } from "../../../lib/api-client";
import { useCalibrationLabels, useDoNotUseTag } from "../api/labels";

/** 30-up 2-5/8 × 1 in sheet on Letter: 1/2 in top, 3/16 in sides, 1/8 in between columns (common label stock). */
const SHEET = "grid w-[8.5in] grid-cols-[repeat(3,2.625in)] auto-rows-[1in] gap-x-[0.125in] px-[0.1875in] pt-[0.5in]";

function PrintBar() {
  return (
    <div className="no-print flex gap-2 border-b border-paper-line bg-paper-raised p-3">
      <Button onClick={() => window.print()}>Print</Button>
      <Button variant="ghost" onClick={() => window.history.back()}>
        Back
      </Button>
      <p className="self-center text-sm text-ink-soft">Print at 100 % (no scaling), no margins.</p>
    </div>
  );
}

/** Calibration labels laid out like the PDF, for printing from the browser. */
export function LabelsPrintView() {
  const [sp] = useSearchParams();
  const tags = (sp.get("assetTags") ?? "").split(",").map((t) => t.trim()).filter(Boolean);
  const skip = Math.min(29, Math.max(0, Number(sp.get("skip") ?? 0) || 0));
  const labels = useCalibrationLabels(tags, skip);
  return (
    <div className="min-h-screen bg-white text-black">
      <style>{"@page { size: letter; margin: 0 } @media print { body { background: white } }"}</style>
      <PrintBar />
      {labels.isPending && <Loading what="Preparing labels" />}
      {labels.isError && <ErrorNote>{errorMessage(labels.error)}</ErrorNote>}
      {labels.data && (
        <div className={SHEET} aria-label="Label sheet">
          {Array.from({ length: skip }, (_, i) => (
            <div key={`skip-${i}`} />
          ))}
          {labels.data.items.map((l) => (
            <div key={l.assetTag} className="flex items-center gap-[5pt] overflow-hidden p-[5pt]">
              <img src={l.qr} alt={`QR code for ${l.assetTag}`} className="h-[62pt] w-[62pt]" />
              <div className="min-w-0 leading-tight">
                <p className="text-[11pt] font-bold">{l.assetTag}</p>
                <p className="text-[6.5pt]">Calibrated {l.calibratedAt ?? "—"}</p>
                <p className="text-[9pt] font-bold">{l.dueAt ? `Due ${l.dueAt}` : l.status === "reference_only" ? "Reference only" : "Not calibrated"}</p>
                <p className="truncate text-[6.5pt]">By {l.calibratedBy ?? "—"}</p>
                {!l.usable && <p className="text-[5.5pt]">Now: {STATUS_LABELS[l.status]} — do not use</p>}
              </div>
            </div>
          ))}
        </div>
      )}
    </div>
  );
}

/** A full-page DO NOT USE tag for printing from the browser. */
export function DoNotUsePrintView() {
  const { assetTag = "" } = useParams();
  const tag = useDoNotUseTag(assetTag);
  return (
    <div className="min-h-screen bg-white text-black">
      <style>{"@page { size: letter; margin: 0.5in }"}</style>
      <PrintBar />
      {tag.isPending && <Loading what="Preparing the tag" />}
      {tag.isError && <ErrorNote>{errorMessage(tag.error)}</ErrorNote>}
      {tag.data && (
        <article className="mx-auto mt-4 max-w-[7.5in] border-[6px] border-stop p-6 text-center">
          <h1 className="bg-stop py-4 text-6xl font-black text-white">DO NOT USE</h1>
          <p className="mt-6 font-mono text-5xl font-bold">{tag.data.assetTag}</p>
          <p className="mt-2 text-xl">{tag.data.description}</p>
          <p className="mt-4 text-2xl font-bold text-stop">{STATUS_LABELS[tag.data.status]}</p>
          {tag.data.reasons.map((r) => (
            <p key={r} className="mt-2 text-lg">
              {r}
            </p>
          ))}
          <p className="mt-4">
            Tagged {tag.data.taggedOn} by {tag.data.taggedBy}
          </p>
          <img src={tag.data.qr} alt={`QR code for ${tag.data.assetTag}`} className="mx-auto mt-4 h-48 w-48" />
          <p className="text-sm">{tag.data.statusUrl}</p>
          <p className="mt-2 text-sm">Leave this tag on the tool until the crib or quality releases it.</p>
          <Cautions className="mt-6 text-left" />
        </article>
      )}
    </div>
  );
}
