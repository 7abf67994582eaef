import { useState } from "react";
import { PageHeader, Card } from "../../../components/ui/layout";
import { TextField } from "../../../components/ui/field";
import { ButtonLink } from "../../../components/ui/button";
import { qs } from "../../../lib/api-client";
import { calibrationLabelsPdfUrl, doNotUsePdfUrl } from "../api/labels";
import { TagListPicker } from "./tag-list-picker";

const linkClass = "inline-flex min-h-10 items-center rounded-md bg-ink px-4 py-2 text-sm font-semibold text-paper";

/** Choose tools and print their calibration labels, or a do-not-use tag, as PDF or as a print view. */
export function LabelsPage() {
  const [tags, setTags] = useState<string[]>([]);
  const [skip, setSkip] = useState("0");
  const [dnu, setDnu] = useState("");
  const skipN = Math.min(29, Math.max(0, Number(skip) || 0));
  return (
    <div className="mx-auto max-w-4xl">
      <PageHeader title="Labels and tags" subtitle="Calibration labels for 30-up 2⅝ × 1 in label sheets (US Letter), and DO NOT USE tags." />
      <Card title="Calibration labels" className="mb-5">
        <TagListPicker tags={tags} setTags={setTags} listLabel="Tools to label" />
        <TextField label="Labels already used on the sheet" type="number" min={0} max={29} value={skip} onChange={(e) => setSkip(e.target.value)} wrapperClassName="mt-3 max-w-xs" hint="Printing starts after them." />
        {tags.length > 0 && (
          <div className="mt-4 flex flex-wrap gap-2">
            <a className={linkClass} href={calibrationLabelsPdfUrl(tags, skipN)} target="_blank" rel="noreferrer">
              Open label PDF
            </a>
            <ButtonLink to={`/print/labels${qs({ assetTags: tags.join(","), skip: skipN || undefined })}`} target="_blank">
              Print view
            </ButtonLink>
          </div>
        )}
      </Card>
      <Card title="DO NOT USE tag">
        <TextField label="Asset tag of the tool to tag" value={dnu} onChange={(e) => setDnu(e.target.value)} className="font-mono" hint="Only for a tool that may not be used (quarantined, out of tolerance, overdue…)." />
        {dnu.trim() && (
          <div className="mt-4 flex flex-wrap gap-2">
            <a className={linkClass} href={doNotUsePdfUrl(dnu.trim())} target="_blank" rel="noreferrer">
              Open tag PDF
            </a>
            <ButtonLink to={`/print/do-not-use/${encodeURIComponent(dnu.trim())}`} target="_blank">
              Print view
            </ButtonLink>
          </div>
        )}
      </Card>
    </div>
  );
}
