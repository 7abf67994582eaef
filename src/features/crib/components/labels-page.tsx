import { useEffect, useState } from "react";
import { PageHeader, Card } from "../../../components/ui/layout";
import { TextField } from "../../../components/ui/field";
import { ButtonLink } from "../../../components/ui/button";
import { qs } from "../../../lib/api-client";
import { calibrationLabelsPdfUrl, doNotUsePdfUrl } from "../api/labels";
import { TagListPicker } from "./tag-list-picker";
import { RoleNotice } from "../../../components/ui/role-notice";
import { useCan, useRoleName } from "../../auth/api/auth";
import { useQuery } from "@tanstack/react-query";
import { toolStatusQueryOptions } from "../api/tool-status";
import { STATUS_LABELS } from "../../../../shared/tools/tool-status";
import { ApiError, errorMessage } from "../../../lib/api-client";

const linkClass = "inline-flex min-h-10 items-center rounded-md bg-ink px-4 py-2 text-sm font-semibold text-paper";

/** Choose tools and print their calibration labels, or a do-not-use tag, as PDF or as a print view. */
export function LabelsPage() {
  const canPrint = useCan("labels.print");
  const roleName = useRoleName();
  if (!canPrint) {
    return (
      <div className="mx-auto max-w-4xl">
        <PageHeader title="Labels and tags" subtitle="Calibration labels and DO NOT USE tags." />
        <RoleNotice roleName={roleName}>cannot print labels or tags; the crib and quality do.</RoleNotice>
      </div>
    );
  }
  return <Labels />;
}

function Labels() {
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
        <DoNotUseLinks tag={dnu.trim()} />
      </Card>
    </div>
  );
}

/** The tag is offered only once the tool's status says it may not be used; a usable tool gets the reason instead. */
function DoNotUseLinks({ tag }: { tag: string }) {
  const [settled, setSettled] = useState(tag);
  useEffect(() => {
    const t = setTimeout(() => setSettled(tag), 300);
    return () => clearTimeout(t);
  }, [tag]);
  const q = useQuery({ ...toolStatusQueryOptions(settled), enabled: !!settled });
  if (!settled || settled !== tag) return null;
  if (q.isPending) return <p className="mt-3 text-ink-soft">Checking {tag.toUpperCase()}…</p>;
  if (q.isError)
    return (
      <p role="alert" className="mt-3 text-stop">
        {q.error instanceof ApiError && q.error.status === 404 ? `No tool has the tag ${tag.toUpperCase()}.` : errorMessage(q.error)}
      </p>
    );
  const s = q.data;
  if (s.usable)
    return (
      <p role="status" className="mt-3 font-semibold">
        {s.assetTag} may be used ({STATUS_LABELS[s.status]}): no DO NOT USE tag. Quarantine it first if it must not be used.
      </p>
    );
  return (
    <div className="mt-4">
      <p className="mb-2 font-semibold text-stop">
        {s.assetTag}: {STATUS_LABELS[s.status]} — may not be used.
      </p>
      <div className="flex flex-wrap gap-2">
        <a className={linkClass} href={doNotUsePdfUrl(s.assetTag)} target="_blank" rel="noreferrer">
          Open tag PDF
        </a>
        <ButtonLink to={`/print/do-not-use/${encodeURIComponent(s.assetTag)}`} target="_blank">
          Print view
        </ButtonLink>
      </div>
    </div>
  );
}
