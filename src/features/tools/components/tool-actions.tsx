import type { ToolDetail } from "../../../../shared/tools/tools.schemas";
import { useCan } from "../../auth/api/auth";
import { useLifecycle, useQuarantine, useRelease } from "../api/tools";
import { ButtonLink } from "../../../components/ui/button";
import { ReasonAction } from "./reason-action";
import { CheckForm } from "./check-form";

/** What the signed-in role may do with this tool, and where to look further. */
export function ToolActions({ tool }: { tool: ToolDetail }) {
  const tag = tool.assetTag;
  const enc = encodeURIComponent(tag);
  const canCheck = useCan("checks.write");
  const canHold = useCan("holds.write");
  const canLifecycle = useCan("lifecycle.write");
  const canCalibrate = useCan("calibrations.write");
  const quarantine = useQuarantine(tag);
  const release = useRelease(tag);
  const lifecycle = useLifecycle(tag);
  const retired = tool.lifecycle === "retired";

  return (
    <section aria-label="Actions" className="no-print flex flex-col gap-3">
      <div className="flex flex-wrap items-start gap-2">
        {canCalibrate && !retired && (
          <ButtonLink variant="primary" to={`/tools/${enc}/calibrate`}>
            Log calibration
          </ButtonLink>
        )}
        {canHold && !retired && !tool.openHold && (
          <ReasonAction label="Quarantine" variant="danger" prompt={`Why is ${tag} quarantined? (damaged, dropped, suspect…)`} run={(r) => quarantine.mutateAsync(r)} />
        )}
        {canHold && tool.openHold && (
          <ReasonAction
            label="Release from quarantine"
            prompt={`Why may ${tag} be released? (An out-of-tolerance tool needs a passing calibration first.)`}
            run={(r) => release.mutateAsync(r)}
          />
        )}
        {canLifecycle && tool.lifecycle === "active" && (
          <ReasonAction label="Mark inactive" prompt={`Why is ${tag} stored as inactive? It must be calibrated before use again.`} run={(reason) => lifecycle.mutateAsync({ lifecycle: "inactive", reason })} />
        )}
        {canLifecycle && tool.lifecycle === "inactive" && (
          <ReasonAction label="Reactivate" prompt={`Why does ${tag} come back into use?`} run={(reason) => lifecycle.mutateAsync({ lifecycle: "active", reason })} />
        )}
        {canLifecycle && !retired && (
          <ReasonAction label="Retire" variant="ghost" confirmLabel="Retire for good" prompt={`Why is ${tag} retired? A retired tool never comes back into use.`} run={(reason) => lifecycle.mutateAsync({ lifecycle: "retired", reason })} />
        )}
      </div>
      <nav aria-label="About this tool" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        <ButtonLink variant="ghost" className="px-2 underline" to={`/tools/${enc}/chain`}>
          Traceability chain
        </ButtonLink>
        <ButtonLink variant="ghost" className="px-2 underline" to={`/investigations?toolAssetTag=${enc}`}>
          Investigations of this tool
        </ButtonLink>
        <ButtonLink variant="ghost" className="px-2 underline" to={`/analysis/drift/${enc}`}>
          Drift of its errors
        </ButtonLink>
      </nav>
      {canCheck && !retired && <CheckForm tool={tool} />}
    </section>
  );
}
