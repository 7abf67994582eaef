import { useState } from "react";
import type { ToolDetail } from "../../../../shared/tools/tools.schemas";
import { useCan } from "../../auth/api/auth";
import { toolPhotoUrl, useUploadToolPhoto } from "../api/tools";
import { ErrorNote } from "../../../components/ui/layout";
import { errorMessage } from "../../../lib/api-client";
import { fileInputClass } from "../lib/form";

/** The tool's photo (helps the crib tell look-alike tools apart) and, for those who register tools, a way to replace it. */
export function ToolPhoto({ tool }: { tool: ToolDetail }) {
  const canWrite = useCan("tools.write");
  const upload = useUploadToolPhoto(tool.assetTag);
  const [version, setVersion] = useState(0);
  if (!tool.hasPhoto && !canWrite) return null;
  return (
    <div className="mb-3 flex flex-wrap items-end gap-3">
      {tool.hasPhoto && <img src={`${toolPhotoUrl(tool.assetTag)}?v=${version}`} alt={`Photo of ${tool.assetTag}`} className="max-h-40 rounded-md border border-paper-line object-contain" />}
      {canWrite && (
        <label className="no-print flex flex-col gap-1 text-sm font-semibold text-ink-soft">
          {tool.hasPhoto ? "Replace photo" : "Add a photo"}
          <input type="file" className={fileInputClass} accept="image/*" onChange={(e) => e.target.files?.[0] && upload.mutate(e.target.files[0], { onSuccess: () => setVersion((v) => v + 1) })} />
        </label>
      )}
      {upload.isError && <ErrorNote>{errorMessage(upload.error)}</ErrorNote>}
    </div>
  );
}
