import { Link, useParams } from "react-router-dom";
import { OWNER_TYPE_LABELS, type ToolDetail } from "../../../../shared/tools/tools.schemas";
import { KIND_LABELS } from "../../../../shared/families/families.schemas";
import { useTool } from "../api/tools";
import { PageHeader, Card, ErrorNote, Loading, Facts } from "../../../components/ui/layout";
import { Cautions } from "../../../components/ui/cautions";
import { errorMessage } from "../../../lib/api-client";
import { day, len, when } from "../lib/format";
import { ToolAnswer } from "./tool-answer";
import { ToolActions } from "./tool-actions";
import { ElementsCard } from "./elements-card";
import { ChecksCard } from "./checks-card";
import { ToolPhoto } from "./tool-photo";
import { CalibrationHistory } from "../calibrations/calibration-history";
import { FamilyStudiesCard } from "../../studies/api/study-cards";

export function ToolPage() {
  const { assetTag = "" } = useParams();
  const tool = useTool(assetTag);
  if (tool.isPending) return <Loading what={`Looking up ${assetTag}`} />;
  if (tool.isError) return <ErrorNote>{errorMessage(tool.error)}</ErrorNote>;
  const t = tool.data;
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title={
          <>
            {t.assetTag} <span className="font-normal text-ink-soft">— {t.description}</span>
          </>
        }
        subtitle={`${t.familyName} · ${len(t.rangeMin, t.unit)} – ${len(t.rangeMax, t.unit)}`}
        actions={
          <Link className="self-center text-sm underline" to="/tools">
            Tool register
          </Link>
        }
      />
      <ToolAnswer answer={t} assetTag={t.assetTag} />
      <Cautions compact />
      <ToolActions tool={t} />
      <div className="grid gap-5 lg:grid-cols-2">
        <Card title="Details">
          <ToolPhoto tool={t} />
          <ToolFacts t={t} />
        </Card>
        <Card title="Custody and holds">
          <Facts
            items={[
              ["Custodian", t.custodian ? `${t.custodian.name} since ${when(t.custodian.since)}` : "In the crib (not issued)"],
              ["Due back", t.custodian ? when(t.custodian.dueBackAt) : null],
              ["Quarantine", t.openHold ? `Since ${when(t.openHold.placedAt)}: ${t.openHold.reason}` : "None"],
              ["Uses left before recalibration", t.usesRemaining],
              ["Last calibration", t.lastCalibration ? `${day(t.lastCalibration.performedAt)} (${t.lastCalibration.result})` : "None that counts"],
            ]}
          />
          {t.lifecycleEvents.length > 0 && (
            <>
              <h3 className="mb-1 mt-4 text-sm font-semibold text-ink-soft">Lifecycle history</h3>
              <ul className="flex flex-col gap-1 text-sm">
                {t.lifecycleEvents.map((e, i) => (
                  <li key={i}>
                    <span className="text-ink-faint">{when(e.at)}</span> — <strong>{e.lifecycle}</strong>: {e.reason}
                    {e.byName && <span className="text-ink-faint"> ({e.byName})</span>}
                  </li>
                ))}
              </ul>
            </>
          )}
        </Card>
      </div>
      {t.elements.length > 0 && <ElementsCard tool={t} />}
      <CalibrationHistory tool={t} />
      <ChecksCard tool={t} />
      <FamilyStudiesCard familyId={t.family.id} familyName={t.familyName} />
    </div>
  );
}

function ToolFacts({ t }: { t: ToolDetail }) {
  const owner = t.ownerType === "shop" ? OWNER_TYPE_LABELS.shop : `${OWNER_TYPE_LABELS[t.ownerType]}${t.ownerUserName || t.ownerName ? ` — ${t.ownerUserName ?? t.ownerName}` : ""}`;
  return (
    <Facts
      items={[
        ["Family", `${t.familyName} (${KIND_LABELS[t.kind]})`],
        ["Maker / model", [t.maker, t.model].filter(Boolean).join(" / ") || null],
        ["Serial number", t.serialNumber],
        ["Range", `${len(t.rangeMin, t.unit)} – ${len(t.rangeMax, t.unit)}`],
        ["Resolution", len(t.resolution, t.unit)],
        ["Unit", t.unit === "in" ? "inch" : "millimetre"],
        ["Permissible error", t.family.mpe == null ? null : `± ${len(t.family.mpe, t.unit)}`],
        ["Interval", `${t.intervalDays} days${t.usageLimit ? ` or ${t.usageLimit} issues, whichever comes first` : ""}`],
        ["Location", t.location],
        ["Owner", owner],
        ["Acceptance readings", t.acceptanceUse && t.calibrationRequired ? "May be used for acceptance readings" : "Not for acceptance readings (reference only)"],
        ["Notes", t.notes],
      ]}
    />
  );
}
